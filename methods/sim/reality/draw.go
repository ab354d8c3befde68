package reality

// DrawLift replaces every configuration's true lift with draws from the
// prior the campaign states, β ~ N(0, sd²) per axle (and γ ~ N(0, sd²)
// when linear is true), seeded: days for simulation-based calibration
// (Talts et al., 2018), where the truth must come from the prior the
// fusion assumes. The β draws do not depend on linear. Keep sd small
// enough for a car (the taps' Cp correction grows with |β|).
func (d *Day) DrawLift(seed int64, sd float64, linear bool) {
	r := stream(seed, "truth/lift")
	for i := range d.Configs {
		c := &d.Configs[i]
		c.Front, c.Rear = sd*r.NormFloat64(), sd*r.NormFloat64()
		c.FrontSlope, c.RearSlope = 0, 0
	}
	if !linear {
		return
	}
	for i := range d.Configs {
		c := &d.Configs[i]
		c.FrontSlope, c.RearSlope = sd*r.NormFloat64(), sd*r.NormFloat64()
	}
}
