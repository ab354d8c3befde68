package report

import "fmt"

// notes are the method notes, assumptions and safety cautions.
func (r *reporter) notes() {
	pg := r.pg
	pg.h1("Method notes, assumptions and cautions")
	pg.h2("Conventions", 20)
	pg.para("Terms follow SAE J1594 (Vehicle Aerodynamics Terminology). Lift is positive upward and downforce is negative lift. Axle lift is resolved about a centre at ground level, mid-wheelbase, so it includes the pitching moment of drag: it is the change of the axle's tyre loads, what the springs feel and what grip depends on. C_L·A is the lift coefficient times its reference area, per axle; with a frontal area A, C_LF = C_L·A(front)/A and C_LR = C_L·A(rear)/A. Forces are given at the stated speeds in still air with the test day's air density.")
	pg.h2("What each method cannot see", 30)
	var limits []string
	for _, m := range methodReports() {
		limits = append(limits, m.limits...)
	}
	pg.bullets(limits)
	pg.h2("Modelled approximately, or not at all", 25)
	pg.bullets([]string{
		"Anti-dive and anti-squat geometry, which lets drive and braking forces lift or squat the body, is not modelled: compare steady-speed windows only.",
		"The along-road wind is one value for the session, estimated from runs in both directions; gusts and crosswind are not modelled.",
		"Stiffness, gains and method scales are log-normal factors known to first order; suspension friction is a band of stated width.",
	})
	pg.h2("Safety", 40)
	pg.para("On-road aerodynamic testing happens at speed and can hurt people. Test only on closed roads or tracks with the owner's permission and proper marshalling, within the local law. Secure every sensor, bracket, cable, tube and ballast mass so that nothing can come loose at speed. Stay within the tyres' speed rating and load index, and check pressures before each run. Temporary springs, removed anti-roll bars or added ballast change how the car brakes and handles: drive it gently until the driver knows it. Keep people off the edges of the runway and out of the run-off areas. These notes do not replace local codes, the venue's rules or licensed practice, which take precedence.")
}

// provenance lists what produced the report: tool, inputs, air, sampler.
func (r *reporter) provenance() {
	pg := r.pg
	c := r.in.Campaign
	pg.h2("Provenance", 45)
	d := r.res.Diagnostics
	rows := [][]string{
		{"tool", "liftfuse " + r.in.Version},
		{"campaign file", c.File},
		{"inputs SHA-256", r.res.Campaign.SHA256},
		{"air density", fmt.Sprintf("%.4f kg/m³ (%s; %g °C, %g hPa, %g %% RH, %g ppm CO₂)", r.res.Air.DensityKgM3, r.res.Air.Method, c.Air.TemperatureC, c.Air.PressureHPa, c.Air.HumidityPct, c.Air.CO2ppm)},
		{"seed", fmt.Sprintf("%d", d.Seed)},
		{"sampler", d.Sampler},
		{"draws", fmt.Sprintf("%d", d.Draws)},
	}
	if d.RhatMax != nil {
		rows = append(rows, []string{"convergence", fmt.Sprintf("rank-normalised split R-hat ≤ %.3f, bulk ESS ≥ %.0f (Vehtari et al. 2021)", *d.RhatMax, *d.ESSMin)})
	}
	for i, f := range c.Files {
		rows = append(rows, []string{fmt.Sprintf("input %d", i+1), f})
	}
	pg.table([]column{{"item", 1, "L"}, {"value", 4, "L"}}, rows)
	if len(r.res.Warnings) > 0 {
		pg.h2("Warnings", 15)
		pg.bullets(r.res.Warnings)
	}
}
