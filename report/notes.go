package report

import (
	"fmt"
	"strings"
)

// notes are the method notes, assumptions and safety cautions, for what
// this campaign used and where it ran.
func (r *reporter) notes() {
	pg := r.pg
	c := r.in.Campaign
	pg.h1("Method notes, assumptions and cautions")
	pg.h2("Conventions", 20)
	pg.para("Terms follow SAE J1594 (Vehicle Aerodynamics Terminology). Lift is positive upward and downforce is negative lift. Axle lift is resolved about a centre at ground level, mid-wheelbase, so it includes the pitching moment of drag: it is the change of the axle's tyre loads, what the springs feel and what grip depends on. " + symCLA + " is the lift coefficient times its reference area, per axle; with a frontal area A, " + symCLF + " = " + symCLA + "(front)/A and " + symCLR + " = " + symCLA + "(rear)/A. Forces are given at the stated speeds in still air with the test day's air density.")
	pg.para("Balance is front minus rear " + symCLA + " (m²): how much more lift the front axle gains than the rear. It keeps its meaning when an axle is in downforce or the total is near zero, where a front share of the total (front/total, kept in the result document as front_share) swings without bound. A positive balance moves the car towards understeer at speed, a negative one towards oversteer; a change of balance between configurations is the change of handling to look for.")
	pg.h2("What each method cannot see", 30)
	var limits []string
	for _, m := range methodReports() {
		limits = append(limits, m.limits(c)...)
	}
	pg.bullets(limits)
	pg.h2("Modelled approximately, or not at all", 25)
	approx := []string{"Anti-dive and anti-squat geometry, which lets drive and braking forces lift or squat the body, is not modelled: compare steady-speed windows only."}
	if len(c.Evidence.RideHeight) > 0 {
		approx = append(approx, fmt.Sprintf("Load moved from front to rear by a window's mean acceleration (the slope of its speed) is modelled through the centre-of-gravity height (%.2f ± %.2f m); the first and last moments of each steady window, still on the speed ramps, are left out.", c.Vehicle.CGHeightM, c.Vehicle.CGHeightSDM))
	}
	if c.Air.WindSDMs > 0 {
		wind := "The along-road wind is a session mean estimated from runs in both directions"
		if c.Air.GustSDMs > 0 {
			wind += ", plus a deviation per run (gusts) whose scatter is estimated from the runs; gusts within a run and crosswind are not modelled."
		} else {
			wind += "; gusts and crosswind are not modelled."
		}
		approx = append(approx, wind)
	} else {
		approx = append(approx, "No wind was modelled (air.wind_sd_ms is 0): the speeds are taken as air speeds.")
	}
	var factors []string
	if len(c.Evidence.RideHeight) > 0 {
		factors = append(factors, "stiffness and gains")
	}
	if len(c.Evidence.Pressure) > 0 {
		factors = append(factors, "the taps' integration scale")
	}
	if len(factors) > 0 {
		approx = append(approx, upperFirst(strings.Join(factors, " and "))+" are log-normal factors known to first order.")
	}
	for _, e := range c.Evidence.RideHeight {
		if e.FrictionMm > 0 {
			approx = append(approx, "Suspension friction is a band of stated width; at rest after a stop the body sticks at one side of it, modelled as one offset per axle.")
			break
		}
	}
	pg.bullets(approx)
	pg.h2("Safety", 40)
	pg.para(r.safety())
}

// safety is the safety caution for where the campaign ran.
func (r *reporter) safety() string {
	where := "the test venue"
	if s := r.in.Campaign.Campaign.Site; s != "" {
		where = s
	}
	edges := "the edges of the track or road"
	if strings.Contains(strings.ToLower(where), "runway") {
		edges = "the edges of the runway"
	}
	return fmt.Sprintf("On-road aerodynamic testing happens at speed and can hurt people. This campaign ran at %s: test only on closed roads or tracks with the owner's permission and proper marshalling, within the local law. Secure every sensor, bracket, cable, tube and ballast mass so that nothing can come loose at speed. Stay within the tyres' speed rating and load index, and check pressures before each run. Temporary springs, removed anti-roll bars or added ballast change how the car brakes and handles: drive it gently until the driver knows it. Keep people off %s and out of the run-off areas. These notes do not replace local codes, the venue's rules or licensed practice, which take precedence.", where, edges)
}

// maxFullTitle is how many characters of the title Provenance gives: the
// campaign format's limit, so that a longer title (from a document not
// validated) cannot make a row taller than a page.
const maxFullTitle = 2000

// fullTitle is the title as Provenance gives it.
func (r *reporter) fullTitle() string {
	t := []rune(r.in.Campaign.Campaign.Title)
	if len(t) > maxFullTitle {
		return string(t[:maxFullTitle]) + ellipsis
	}
	return string(t)
}

// upperFirst capitalises the first letter.
func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// provenance lists what produced the report: tool, inputs, air, sampler.
func (r *reporter) provenance() {
	pg := r.pg
	c := r.in.Campaign
	pg.h2("Provenance", 45)
	rows := [][]string{
		{"tool", "liftfuse " + r.in.Version},
		{"campaign file", c.File},
		{"inputs SHA-256", r.res.Campaign.SHA256},
		{"air density", fmt.Sprintf("%.4f kg/m³ (%s; %g °C, %g hPa, %g %% RH, %g ppm CO₂)", r.res.Air.DensityKgM3, r.res.Air.Method, c.Air.TemperatureC, c.Air.PressureHPa, c.Air.HumidityPct, c.Air.CO2ppm)},
	}
	if d := r.res.Diagnostics; d != nil {
		rows = append(rows, []string{"seed", fmt.Sprintf("%d", d.Seed)}, []string{"sampler", d.Sampler}, []string{"draws", fmt.Sprintf("%d", d.Draws)})
		if d.RhatMax != nil && d.ESSMin != nil {
			rows = append(rows, []string{"convergence", fmt.Sprintf("rank-normalised split R-hat ≤ %.3f, bulk ESS ≥ %.0f (Vehtari et al. 2021)", *d.RhatMax, *d.ESSMin)})
		}
	}
	for i, f := range c.Files {
		rows = append(rows, []string{fmt.Sprintf("input %d", i+1), f})
	}
	if r.titleCut {
		rows = append([][]string{{"title", r.fullTitle()}}, rows...)
	}
	pg.table([]column{{"item", 1, "L"}, {"value", 4, "L"}}, rows)
	if len(r.res.Warnings) > 0 {
		pg.h2("Warnings", 15)
		pg.bullets(r.res.Warnings)
	}
}
