package height

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// TestTraceDecimation: the trace keeps the first sample, then the first
// sample at least traceStep after the one kept before (at 10 Hz, every
// second or third sample as the times round), and stops at maxTrace
// points however long the log — a 40 s log and one 10 % past the cap
// (common practice (no source): a plot's excerpt is bounded); a short
// log's trace holds no more than twice its own length.
func TestTraceDecimation(t *testing.T) {
	cal := Calibration{Gain: 10}
	for _, tc := range []struct {
		name     string
		rows     int
		min, max int
	}{
		{"short", 400, 134, 200},
		{"past the cap", int(1.1 * maxTrace * traceStep * 10), maxTrace, maxTrace},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var b strings.Builder
			b.WriteString("t,v,d,h\n")
			for i := range tc.rows {
				fmt.Fprintf(&b, "%.1f,100,1,%g\n", float64(i)/10, 1+0.01*math.Sin(float64(i)))
			}
			_, tr, err := Windows(strings.NewReader(b.String()), "x.csv", rulesEntry(false), 0, cal, 1.2, "only")
			if err != nil {
				t.Fatal(err)
			}
			if 2*len(tr) < cap(tr) {
				t.Fatalf("%d trace points kept in room for %d", len(tr), cap(tr))
			}
			if len(tr) < tc.min || len(tr) > tc.max || tr[0].T != 0 {
				t.Fatalf("%d trace points from %g s, want %d to %d from 0 s", len(tr), tr[0].T, tc.min, tc.max)
			}
			for k, p := range tr {
				i := math.Round(p.T * 10)
				if p.Raw != 10*(1+0.01*math.Sin(i)) {
					t.Fatalf("trace point %d at %g s: raw %g is not that sample's", k, p.T, p.Raw)
				}
				if dt := p.T - tr[max(k-1, 0)].T; k > 0 && (dt < traceStep-1e-9 || dt > traceStep+0.1+1e-9) {
					t.Fatalf("trace point %d %g s after the one before", k, dt)
				}
			}
		})
	}
}
