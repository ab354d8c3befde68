package checks

import (
	"fmt"
	"math"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
)

// notLinear reports the configurations whose height is not linear in q:
// the extra-sum-of-squares F test of a q² term (heightfit.go) at
// alphaNotLinear shared over the entry's configurations.
func notLinear(c *campaign.Campaign, r *height.Result, fits []cfgFit) []Check {
	var out []Check
	alpha := alphaNotLinear / float64(max(1, len(fits)))
	for _, f := range fits {
		if f.PCurv < alpha {
			out = append(out, notLinearCheck(c, r, f, ""))
		}
	}
	return out
}

// notLinearCheck words a height-not-linear finding; by, when not empty,
// names the entry on the same axle whose own finding this one confirms.
func notLinearCheck(c *campaign.Campaign, r *height.Result, f cfgFit, by string) Check {
	ch := Check{Check: evidence.IDHeightNotLinear, Entry: r.Entry.ID, Config: f.Config, PValue: f.PCurv,
		Cause: "ride height is not linear in dynamic pressure: bump-stop or packer contact, progressive springs, or the sensor at its end stop"}
	if c.Prior.SpeedModel != campaign.SpeedLinear {
		ch.Cause += "; or the lift itself changes with speed (prior.speed_model: linear)"
	}
	if by != "" {
		ch.Cause = fmt.Sprintf("ride height is not linear in dynamic pressure, as %s on the same axle finds in this configuration: bump-stop or packer contact, or progressive springs", by)
	}
	if f.Broken {
		ch.Where = "every speed"
		ch.Action = fmt.Sprintf("measure the stiffness of %s's axle over the loads of the runs (ballast steps up to the aero load), or check the sensor's travel", r.Entry.ID)
	} else {
		ch.Where = fmt.Sprintf("windows above %.0f km/h", f.CutKmh)
		ch.Action = fmt.Sprintf("set max_speed_kmh: %.0f on %s, or measure the stiffness at that load", f.CutKmh, r.Entry.ID)
	}
	return ch
}

// alphaConfirm is the level at which a second entry on an axle confirms
// another entry's finding that the axle is not linear in a configuration
// (common practice, no source). A bump stop or progressive spring belongs
// to the axle, so every sensor that reads it carries the bend; a sensor
// with more noise (a laser, which also sees the tyres) may show it less
// clearly. On a clean day the confirmation is asked only after a first
// finding (≤ 0.2 % per entry), so it adds at most 0.2 % × 5 % to an
// entry's false-alarm rate.
const alphaConfirm = 0.05

// heightRun is one ride-height entry's result and its fits.
type heightRun struct {
	r    *height.Result
	fits []cfgFit
}

// confirmNotLinear adds, for every height-not-linear finding, the same
// finding on each other ride-height entry that reads the same axle when its
// own curvature test of that configuration has p < alphaConfirm.
func confirmNotLinear(c *campaign.Campaign, runs []heightRun, found []Check) []Check {
	have := map[[2]string]bool{}
	for _, ch := range found {
		if ch.Check == evidence.IDHeightNotLinear {
			have[[2]string{ch.Entry, ch.Config}] = true
		}
	}
	var out []Check
	for _, ch := range found {
		if ch.Check != evidence.IDHeightNotLinear {
			continue
		}
		src := runOf(runs, ch.Entry)
		for _, o := range runs {
			if o.r == src.r || !shareAxle(src.r, o.r) {
				continue
			}
			for _, f := range o.fits {
				key := [2]string{o.r.Entry.ID, f.Config}
				if f.Config == ch.Config && !have[key] && f.PCurv < alphaConfirm {
					have[key] = true
					out = append(out, notLinearCheck(c, o.r, f, ch.Entry))
				}
			}
		}
	}
	return out
}

func runOf(runs []heightRun, id string) heightRun {
	for _, r := range runs {
		if r.r.Entry.ID == id {
			return r
		}
	}
	return heightRun{}
}

// shareAxle reports whether two entries' readings depend on a common axle.
func shareAxle(a, b *height.Result) bool {
	if a == nil || b == nil {
		return false
	}
	for _, x := range a.Lever.Axles {
		for _, y := range b.Lever.Axles {
			if x.Axle == y.Axle {
				return true
			}
		}
	}
	return false
}

// residualSD is the size, in standard deviations, beyond which a window is
// reported (model.md).
const residualSD = 4

// maxOutliers bounds the windows reported per configuration.
const maxOutliers = 3

// residuals reports windows whose internally studentised residual
// z_i = r_i·√w_i / (s·√(1 − h_ii)) from the linear fit exceeds 4 in size and
// whose Bonferroni p-value n·P(|Z| > |z_i|) is below alphaResidual (s is
// the robust scale of the fit, at least 1; the windows' variances are
// pooled, windowVars). The worst window is taken out and the rest refitted
// before the next is looked at, so that one upset window, pulling the line,
// does not make a good one look off (swamping; Barnett & Lewis, Outliers in
// Statistical Data, 3rd ed., §2.3).
func residuals(c *campaign.Campaign, r *height.Result, d *entryData, fits []cfgFit) []Check {
	n := 0
	for _, f := range fits {
		n += len(f.Kept)
	}
	linearSpeed := c.Prior.SpeedModel == campaign.SpeedLinear
	var out []Check
	for _, f := range fits {
		kept, fit := f.Kept, f.Lin
		for range maxOutliers {
			k, z := worst(fit, robustScale(fit))
			p := math.Min(1, float64(n)*normTwoSided(z))
			if k < 0 || math.Abs(z) <= residualSD || p >= alphaResidual {
				break
			}
			w := r.Windows[kept[k]]
			out = append(out, Check{Check: evidence.IDWindowResidual, Entry: r.Entry.ID, Config: f.Config, PValue: p,
				Where: fmt.Sprintf("log %s, %.0f–%.0f s at %.0f km/h (%+.2f mm, %.1f sd)", r.Entry.Logs[w.Log].File, w.From, w.To, w.SpeedKmh, fit.Resid[k], z),
				Cause: "one window is off the line of the others: a gust, a bump or crest, traffic, or a driver input",
				Action: fmt.Sprintf("look at the trace of %s over %.0f–%.0f s and cut that stretch from the log's segments if it was not steady",
					r.Entry.ID, w.From, w.To)})
			kept = append(append([]int(nil), kept[:k]...), kept[k+1:]...)
			x, y, wt := design(d, kept, linearSpeed, nil, f.QScale)
			var err error
			if fit, err = wls(x, y, wt); err != nil {
				break
			}
		}
	}
	return out
}

// worst returns the row with the largest studentised residual and that
// residual, or −1.
func worst(fit *wlsFit, scale float64) (int, float64) {
	k, zk := -1, 0.0
	for i := range fit.Resid {
		lev := math.Min(fit.Lev[i], 0.99)
		z := fit.Resid[i] * math.Sqrt(fit.W[i]) / (scale * math.Sqrt(1-lev))
		if math.Abs(z) > math.Abs(zk) {
			k, zk = i, z
		}
	}
	return k, zk
}

// negativeGain notes a negative calibration gain (mm per unit of signal);
// confirmGain keeps it only when the entry's own lift is not confirmed by
// the others on its axle.
func negativeGain(r *height.Result) []Check {
	if r.Calibration.Gain >= 0 {
		return nil
	}
	return []Check{{Check: evidence.IDGainNegative, Entry: r.Entry.ID, Where: "calibration",
		Cause:  fmt.Sprintf("the calibration gain is negative (%.3g mm per unit): unit or sign slip?", r.Calibration.Gain),
		Action: fmt.Sprintf("check the sign of %s's calibration: height must rise when the body rises; if this sensor's signal falls as the body rises, the sign is right", r.Entry.ID)}}
}

// heightEstimates turns each configuration's slope into the axle's C_L·A
// at 100 km/h: β = K·(b − g/q₁₀₀), with b the height per Pa of q, g a laser's
// tyre growth prior (mm at 100 km/h) and q₁₀₀ = ½ρ(100 km/h)². Its noise is
// the slope's (scaled by s² when the residuals are wider than the SEs);
// its systematic errors, under the evidence's names, are the stiffness
// groups (β ∝ K: a group entering the compliance with power p moves β by
// −p·sd), the calibration gain unless a ballast stiffness cancels it, and
// the growth prior (∂β/∂g = −K/q₁₀₀).
func heightEstimates(c *campaign.Campaign, r *height.Result, fits []cfgFit) []estimate {
	K := r.Stiffness.K
	q100 := air.DynamicPressure(c.Density(), air.KmhToMs(evidence.RefSpeedKmh))
	var g, gsd float64
	if r.Entry.Sensor == campaign.SensorLaser {
		g, gsd = r.Entry.TyreGrowth.MmAt100kmh, r.Entry.TyreGrowth.SDMm
	}
	rel := map[string]float64{}
	for _, ref := range r.Stiffness.Refs {
		for _, grp := range r.Stiffness.Groups {
			if grp.Name == ref.Name {
				rel[grp.Name] += -ref.Pow * grp.SD
			}
		}
	}
	if !r.Stiffness.GainCancels && r.Calibration.RelSD > 0 {
		rel[r.Entry.ID+"/gain"] = r.Calibration.RelSD
	}
	abs := map[string]float64{}
	if gsd > 0 {
		abs[r.Entry.Axle+"-tyre-growth"] = -K * gsd / q100
	}
	var out []estimate
	for _, f := range fits {
		b := f.Lin.Beta[0] / f.QScale
		vb := f.Lin.Cov.At(0, 0) / (f.QScale * f.QScale) * math.Max(1, f.Lin.RSS/float64(max(1, f.Lin.DF)))
		e := estimate{Entry: r.Entry.ID, Kind: evidence.KindRideHeight, Config: f.Config, Axle: r.Entry.Axle,
			Raw: K * b, Corr: -K * g / q100, Stat: K * math.Sqrt(vb), Abs: abs, Rel: rel}
		e.total()
		out = append(out, e)
	}
	return out
}
