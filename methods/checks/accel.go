package checks

import (
	"math"

	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
)

// entryData is a ride-height entry's windows as the height checks fit
// them: each window's height with the load transfer of its mean
// acceleration taken out, and its variance.
type entryData struct {
	ws []height.Window
	e  *campaign.RideHeightEntry
	y  []float64 // height less κ_i·h̄_cg, mm
	v  []float64 // variance of y_i, mm²
}

// newEntryData prepares an entry's windows. A window's mean acceleration a
// moves m·a·h_cg/L of load from the front axle to the rear (model.md,
// "Longitudinal acceleration"), which moves the height by κ_i·h_cg; a
// window at standstill that catches the first second of a ramp carries
// several tenths of a millimetre of it, of opposite sign at the start and
// the end of a pass, which a straight line in q cannot follow. κ_i is the
// adapter's own coefficient (Result.AccelCoef, the evidence's h_cg term),
// so the check and the fusion model the same thing; h_cg is taken at its prior mean h̄, and
// the variance gains (κ_i·σ_hcg)² for its prior sd and (κ(SE_a,i)·h̄)² for
// the error of the acceleration estimate (κ is linear in a), as the adapter's window variance does. The prior's part is
// common to the windows; taking it as independent costs little, as it is
// a few hundredths of a millimetre. Each window's variance also gains the
// run-to-run wind the adapter models: a run's wind deviation g moves the
// height by the window's GustSens·g (the adapter's nuisance coefficient),
// so var ε_i += (GustSens_i·σ_g)², σ_g the adapter's estimate
// (Result.GustSDMs). The windows of one run share their deviation; taken
// as independent here, the variance errs wide for one window off the line
// of the others. Without it, a window at the top speed reads a few sd off
// on a clean day of the independent simulator whenever its run's wind is
// a sd or two from the mean.
func newEntryData(c *campaign.Campaign, r *height.Result) *entryData {
	d := &entryData{ws: r.Windows, e: r.Entry, y: make([]float64, len(r.Windows)), v: windowVars(r.Windows, r.Entry.FrictionMm)}
	h, sd := c.Vehicle.CGHeightM, c.Vehicle.CGHeightSDM
	for i, w := range r.Windows {
		kappa := r.AccelCoef(c.Vehicle, w.AccelMs2)
		d.y[i] = w.HeightMM - kappa*h
		se := r.AccelCoef(c.Vehicle, w.AccelSE) * h
		d.v[i] += math.Pow(kappa*sd, 2) + se*se
		g := w.GustSens * r.GustSDMs
		d.v[i] += g * g
	}
	return d
}
