package checks

import (
	"fmt"
	"math"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// A top speed is "a factor 3.6 off" when ×3.6 (or ÷3.6) brings it within
// this ratio of the reference and it is under half (over twice) the
// reference as logged (common practice, no source).
const (
	unitRatioLo = 0.7
	unitRatioHi = 1.4
)

// source is one place the campaign's speeds come from: a log (shared by
// the ride-height entries that read it), a pressure entry's readings, a
// vortex entry's observations, or the report speeds.
type source struct {
	entries []string
	where   string
	top     float64
	checked bool // the report speeds are a reference only
}

// speedSources lists every source of speeds with its top speed.
func speedSources(c *campaign.Campaign, r *methods.Reduced) []*source {
	var out []*source
	byLog := map[string]*source{}
	for _, e := range r.Entries {
		switch d := e.Detail.(type) {
		case *height.Result:
			for li, l := range d.Entry.Logs {
				col := "speed_kmh: " + l.SpeedKmh
				if l.SpeedMs != "" {
					col = "speed_ms: " + l.SpeedMs
				}
				key := l.File + "\x00" + col
				s, ok := byLog[key]
				if !ok {
					s = &source{where: "log " + l.File + " (" + col + ")", checked: true}
					byLog[key] = s
					out = append(out, s)
				}
				s.entries = append(s.entries, e.ID)
				for _, w := range d.Windows {
					if w.Log == li {
						s.top = math.Max(s.top, w.SpeedKmh)
					}
				}
			}
		case *pressure.Result:
			s := &source{entries: []string{e.ID}, where: "readings' speed_kmh", checked: true}
			for _, rd := range d.Readings {
				s.top = math.Max(s.top, rd.SpeedKmh)
			}
			out = append(out, s)
		case *vortex.Result:
			s := &source{entries: []string{e.ID}, where: "observations' speed_kmh", checked: true}
			for _, ob := range d.Entry.Observations {
				s.top = math.Max(s.top, ob.SpeedKmh)
			}
			out = append(out, s)
		}
	}
	rep := &source{where: "report speeds"}
	for _, v := range c.Report.SpeedsKmh {
		rep.top = math.Max(rep.top, v)
	}
	return append(out, rep)
}

// speedUnits compares the top speed of each source of speeds (a log, a
// pressure entry's readings, a vortex entry's observations) with the median
// of the others' (the report speeds included): a top speed 3.6 times too
// low is m/s under a km/h column, 3.6 times too high the reverse. A rule:
// p_value 0. Every entry that reads the source is named.
func speedUnits(c *campaign.Campaign, r *methods.Reduced) []Check {
	srcs := speedSources(c, r)
	var out []Check
	for i, s := range srcs {
		if !s.checked {
			continue
		}
		var others []float64
		for j, o := range srcs {
			if j != i && o.top > 0 {
				others = append(others, o.top)
			}
		}
		ref := median(others)
		if ref <= 0 {
			continue
		}
		for _, id := range s.entries {
			if ch, ok := unitSlip(id, s.where, s.top, ref); ok {
				out = append(out, ch)
			}
		}
	}
	return out
}

// unitSlip applies the rule to one top speed.
func unitSlip(entry, where string, top, ref float64) (Check, bool) {
	if top <= 0 {
		return Check{}, false
	}
	ch := Check{Check: evidence.IDSpeedUnits, Entry: entry}
	switch {
	case top < ref/2 && within(top*3.6/ref):
		ch.Cause = fmt.Sprintf("the top steady speed is %.0f, and ×3.6 = %.0f matches the campaign's %.0f km/h: speed in m/s under a km/h column?", top, top*3.6, ref)
		ch.Action = "if the column holds m/s, name it under speed_ms instead of speed_kmh"
	case top > 2*ref && within(top/3.6/ref):
		ch.Cause = fmt.Sprintf("the top steady speed is %.0f km/h, and ÷3.6 = %.0f matches the campaign's %.0f km/h: speed in km/h under an m/s column?", top, top/3.6, ref)
		ch.Action = "if the column holds km/h, name it under speed_kmh instead of speed_ms"
	default:
		return Check{}, false
	}
	ch.Where = where
	return ch, true
}

func within(ratio float64) bool { return ratio >= unitRatioLo && ratio <= unitRatioHi }
