package methods

import (
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// reduceHeight runs the ride-height adapter; sensors logged in one file
// share one read of it.
func reduceHeight(c *campaign.Campaign, opt Options) ([]Entry, error) {
	es := make([]*campaign.RideHeightEntry, len(c.Evidence.RideHeight))
	for i := range es {
		es[i] = &c.Evidence.RideHeight[i]
	}
	if len(es) == 0 {
		return nil, nil
	}
	hs, err := height.ReduceAll(c, es, opt.Height)
	if err != nil {
		return nil, err
	}
	out := make([]Entry, len(hs))
	for i, h := range hs {
		out[i] = Entry{ID: h.Entry.ID, Kind: evidence.KindRideHeight, Evidence: h.Evidence, Warnings: h.Warnings, Detail: h}
	}
	return out, nil
}

// reducePressure runs the pressure adapter on each entry.
func reducePressure(c *campaign.Campaign, _ Options) ([]Entry, error) {
	var out []Entry
	for i := range c.Evidence.Pressure {
		p, err := pressure.Reduce(c, &c.Evidence.Pressure[i], c.WindNuisance())
		if err != nil {
			return nil, err
		}
		out = append(out, Entry{ID: p.Entry.ID, Kind: evidence.KindPressure, Evidence: p.Evidence, Warnings: p.Warnings, Detail: p})
	}
	return out, nil
}

// reduceVortex runs the vortex-sense adapter on each entry.
func reduceVortex(c *campaign.Campaign, _ Options) ([]Entry, error) {
	var out []Entry
	for i := range c.Evidence.Vortex {
		v, err := vortex.Reduce(c, &c.Evidence.Vortex[i])
		if err != nil {
			return nil, err
		}
		out = append(out, Entry{ID: v.Entry.ID, Kind: evidence.KindVortex, Evidence: v.Evidence, Detail: v})
	}
	return out, nil
}
