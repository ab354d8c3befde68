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
// adapter's own coefficient (the evidence's h_cg term), so the check and
// the fusion model the same thing; h_cg is taken at its prior mean h̄, and
// the variance gains (κ_i·σ_hcg)² for its prior sd and (κ'·SE_a,i·h̄)² for
// the error of the acceleration estimate (κ' = κ_i/a_i, the coefficient
// per m/s²), as the adapter's window variance does. The prior's part is
// common to the windows; taking it as independent costs little, as it is
// a few hundredths of a millimetre.
func newEntryData(c *campaign.Campaign, r *height.Result) *entryData {
	d := &entryData{ws: r.Windows, e: r.Entry, y: make([]float64, len(r.Windows)), v: windowVars(r.Windows, r.Entry.FrictionMm)}
	kappa := accelCoefs(r)
	per := 0.0
	for i, w := range r.Windows {
		if kappa[i] != 0 && w.AccelMs2 != 0 {
			per = kappa[i] / w.AccelMs2
			break
		}
	}
	h, sd := c.Vehicle.CGHeightM, c.Vehicle.CGHeightSDM
	for i, w := range r.Windows {
		d.y[i] = w.HeightMM - kappa[i]*h
		se := per * w.AccelSE * h
		d.v[i] += math.Pow(kappa[i]*sd, 2) + se*se
	}
	return d
}

// accelCoefs returns each window's coefficient κ_i of the centre-of-gravity
// height in the entry's evidence (mm per m; 0 where it has none). The
// adapter builds one block per log that has windows, one observation per
// window in the order of Result.Windows; when the evidence does not have
// that shape, every κ is 0.
func accelCoefs(r *height.Result) []float64 {
	out := make([]float64, len(r.Windows))
	perLog := map[int][]int{}
	maxLog := -1
	for i, w := range r.Windows {
		perLog[w.Log] = append(perLog[w.Log], i)
		maxLog = max(maxLog, w.Log)
	}
	blocks := r.Evidence.Blocks
	b := 0
	for li := 0; li <= maxLog; li++ {
		idx := perLog[li]
		if len(idx) == 0 {
			continue
		}
		if b >= len(blocks) || len(blocks[b].Obs) != len(idx) {
			return make([]float64, len(r.Windows))
		}
		for k, i := range idx {
			for _, cf := range blocks[b].Obs[k].Nuis {
				if cf.Name == height.CGHeightName {
					out[i] = cf.C
				}
			}
		}
		b++
	}
	return out
}
