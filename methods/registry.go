// Package adapters runs every method adapter of a campaign: the one place
// where the adapters are listed.
package methods

import (
	"fmt"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// Reduced is every adapter's result for one campaign.
type Reduced struct {
	Height   []*height.Result
	Pressure []*pressure.Result
	Vortex   []*vortex.Result
	// Evidence of every entry in campaign order: ride height, pressure,
	// vortex.
	Evidence []evidence.Evidence
	// Warnings of the campaign (validation) and of the adapters.
	Warnings []string
}

// Options tune a reduction.
type Options struct {
	Height height.Options
}

// Reduce runs the adapters on every evidence entry of the campaign.
func Reduce(c *campaign.Campaign, opt Options) (*Reduced, error) {
	r := &Reduced{}
	for _, w := range c.Warnings {
		r.Warnings = append(r.Warnings, w.Error())
	}
	if n := len(c.Evidence.RideHeight); n > 0 {
		es := make([]*campaign.RideHeightEntry, n)
		for i := range es {
			es[i] = &c.Evidence.RideHeight[i]
		}
		hs, err := height.ReduceAll(c, es, opt.Height)
		if err != nil {
			return nil, err
		}
		for _, h := range hs {
			r.Height = append(r.Height, h)
			r.Evidence = append(r.Evidence, h.Evidence)
			r.Warnings = append(r.Warnings, h.Warnings...)
		}
	}
	wind := ""
	if c.Air.WindSDMs > 0 {
		wind = evidence.WindName
	}
	for i := range c.Evidence.Pressure {
		p, err := pressure.Reduce(c, &c.Evidence.Pressure[i], wind)
		if err != nil {
			return nil, err
		}
		r.Pressure = append(r.Pressure, p)
		r.Evidence = append(r.Evidence, p.Evidence)
		r.Warnings = append(r.Warnings, p.Warnings...)
	}
	for i := range c.Evidence.Vortex {
		v, err := vortex.Reduce(c, &c.Evidence.Vortex[i])
		if err != nil {
			return nil, err
		}
		r.Vortex = append(r.Vortex, v)
		r.Evidence = append(r.Evidence, v.Evidence)
	}
	if len(r.Evidence) == 0 {
		return nil, fmt.Errorf("the campaign has no evidence entries")
	}
	return r, nil
}
