package report

import (
	"fmt"
	"sort"
	"strings"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
)

// run is one steady window of a log, as the ride-height entries that read
// that log found it.
type run struct {
	file          string
	from, to      float64
	config        string
	dir           int
	speedKmh, qPa float64
	entries       []string
}

// runs gathers the steady windows of every ride-height entry, one row per
// log and time span however many entries read it, in log and time order.
func (r *reporter) runs() []run {
	byKey := map[string]*run{}
	var keys []string
	for _, h := range methods.Details[*height.Result](r.in.Reduced) {
		for _, w := range h.Windows {
			file := ""
			if w.Log < len(h.Entry.Logs) {
				file = h.Entry.Logs[w.Log].File
			}
			k := fmt.Sprintf("%s|%s|%d|%.0f|%.0f", file, w.Config, w.Direction, w.From, w.To)
			if ru, ok := byKey[k]; ok {
				ru.entries = append(ru.entries, h.Entry.ID)
				continue
			}
			byKey[k] = &run{file: file, from: w.From, to: w.To, config: w.Config, dir: w.Direction, speedKmh: w.SpeedKmh, qPa: w.Q, entries: []string{h.Entry.ID}}
			keys = append(keys, k)
		}
	}
	out := make([]run, 0, len(keys))
	for _, k := range keys {
		out = append(out, *byKey[k])
	}
	sort.SliceStable(out, func(i, j int) bool {
		if out[i].file != out[j].file {
			return out[i].file < out[j].file
		}
		return out[i].from < out[j].from
	})
	return out
}

// runLog writes the table of the steady windows used: when, which
// configuration, which way, how fast, at what dynamic pressure, and which
// entries read it.
func (r *reporter) runLog() {
	rs := r.runs()
	if len(rs) == 0 {
		return
	}
	pg := r.pg
	pg.h1("Run log: the steady windows used")
	files := map[string]bool{}
	for _, ru := range rs {
		files[ru.file] = true
	}
	var rows [][]string
	for _, ru := range rs {
		t := fmt.Sprintf("%.0f–%.0f", ru.from, ru.to)
		if len(files) > 1 {
			t = ru.file + " " + t
		}
		rows = append(rows, []string{t, ru.config, direction(ru.dir), fmt.Sprintf("%.1f", ru.speedKmh), fmt.Sprintf("%.0f", ru.qPa), strings.Join(ru.entries, ", ")})
	}
	pg.table([]column{{"time (s)", 1.1, "L"}, {"configuration", 1, "L"}, {"direction", 0.7, "L"}, {"speed (km/h)", 0.8, "R"}, {"q (Pa)", 0.6, "R"}, {"read by", 2, "L"}}, rows)
	c := r.in.Campaign
	pg.note(fmt.Sprintf("Speed and q are window means (q = ½ρV² with ρ = %.4f kg/m³ from %g °C, %g hPa, %g %% RH). Direction as logged (+1 one way along the road, −1 the other).%s", r.res.Air.DensityKgM3, c.Air.TemperatureC, c.Air.PressureHPa, c.Air.HumidityPct, windNote(c.Air)))
}

// direction writes a logged direction.
func direction(d int) string {
	switch {
	case d > 0:
		return "+1"
	case d < 0:
		return "−1"
	}
	return "–"
}

// windNote says how the wind was handled: a session mean, and a deviation
// per run when air.gust_sd_ms is set (model v2).
func windNote(a campaign.Air) string {
	if !(a.WindSDMs > 0) {
		return " No along-road wind was modelled."
	}
	s := fmt.Sprintf(" The along-road wind is a session mean (prior sd %g m/s), estimated from the runs both ways", a.WindSDMs)
	if a.GustSDMs > 0 {
		s += fmt.Sprintf(", plus a deviation per run whose scatter is estimated from the runs (prior scale %g m/s)", a.GustSDMs)
	}
	return s + "."
}
