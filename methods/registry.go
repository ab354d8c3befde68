// Package methods is the registry of measurement methods: the one contract
// every adapter implements and the one list of adapters. Each adapter lives
// in its own package below this one (methods/height, methods/pressure,
// methods/vortex) and reads the campaign document of methods/campaign.
package methods

import (
	"fmt"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
)

// Entry is what one evidence entry of a campaign reduces to.
type Entry struct {
	ID       string
	Kind     evidence.Kind
	Evidence evidence.Evidence
	Warnings []string
	// Detail is the adapter's own result (*height.Result, *pressure.Result,
	// *vortex.Result): windows, traces, forces, for the report.
	Detail any
}

// Options tune a reduction.
type Options struct {
	Height height.Options
}

// Adapter is the contract every method implements: reduce the campaign's
// entries of its kind, in campaign order.
type Adapter struct {
	Kind   evidence.Kind
	Reduce func(c *campaign.Campaign, opt Options) ([]Entry, error)
}

// Adapters lists every method, in the order their entries are reported.
// Adding a method is one line here (and its wrapper in kinds.go).
func Adapters() []Adapter {
	return []Adapter{
		{evidence.KindRideHeight, reduceHeight},
		{evidence.KindPressure, reducePressure},
		{evidence.KindVortex, reduceVortex},
	}
}

// Reduced is every adapter's result for one campaign.
type Reduced struct {
	// Entries in the order of Adapters, each kind in campaign order.
	Entries []Entry
	// Warnings of the campaign (validation) and of the adapters.
	Warnings []string
}

// Evidence returns every entry's evidence, in the order of Entries.
func (r *Reduced) Evidence() []evidence.Evidence {
	out := make([]evidence.Evidence, len(r.Entries))
	for i, e := range r.Entries {
		out[i] = e.Evidence
	}
	return out
}

// Details returns the adapter results of one type, in order: for example
// Details[*height.Result](r).
func Details[T any](r *Reduced) []T {
	var out []T
	for _, e := range r.Entries {
		if d, ok := e.Detail.(T); ok {
			out = append(out, d)
		}
	}
	return out
}

// Reduce runs every adapter on the campaign.
func Reduce(c *campaign.Campaign, opt Options) (*Reduced, error) {
	r := &Reduced{}
	for _, w := range c.Warnings {
		r.Warnings = append(r.Warnings, w.Error())
	}
	for _, a := range Adapters() {
		es, err := a.Reduce(c, opt)
		if err != nil {
			return nil, err
		}
		for _, e := range es {
			r.Entries = append(r.Entries, e)
			r.Warnings = append(r.Warnings, e.Warnings...)
		}
	}
	if len(r.Entries) == 0 {
		return nil, fmt.Errorf("the campaign has no evidence entries")
	}
	return r, nil
}
