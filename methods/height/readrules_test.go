package height

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/logs"
)

// rulesLog is a 10 Hz, 40 s log at 100 km/h (speed sp(t) when given) whose
// configuration column reads cfg(t); the height is 1 ± 0.01 units.
func rulesLog(cfg func(t float64) string, sp func(t float64) float64) string {
	var b strings.Builder
	b.WriteString("t,v,d,h,c\n")
	for i := range 400 {
		t := float64(i) / 10
		v := 100.0
		if sp != nil {
			v = sp(t)
		}
		fmt.Fprintf(&b, "%.1f,%g,1,%g,%s\n", t, v, 1+0.01*math.Sin(float64(i)), cfg(t))
	}
	return b.String()
}

// rulesEntry reads rulesLog, with its configuration column or without.
func rulesEntry(config bool) *campaign.RideHeightEntry {
	l := campaign.LogSpec{File: "x.csv", Time: "t", SpeedKmh: "v", Signal: "h", Direction: "d"}
	if config {
		l.Config = "c"
	}
	return &campaign.RideHeightEntry{ID: "e", Steady: campaign.Steady{SpeedTolKmh: 1.5, MinDurationS: 4}, FilterTauS: 0.5, Logs: []campaign.LogSpec{l}}
}

func constCfg(id string) func(float64) string { return func(float64) string { return id } }

// TestReadRules holds the rules a log's rows are read by, each of which
// the consumer's fast path for a common row could skip unseen: a change
// of configuration at constant speed ends a window; a campaign of one
// configuration labels windows of a log without a configuration column;
// a speed down to −2 km/h (standstill noise) reads 0, one below it is an
// error at its line and column; a trace point carries the moving average
// of the heights before it. The rules are the adapter's (model.md,
// "Steady windows"; the −2 km/h of standstill jitter: common practice (no
// source)).
func TestReadRules(t *testing.T) {
	cal := Calibration{Gain: 10}
	A := constCfg("A")
	t.Run("a change of configuration ends a window", func(t *testing.T) {
		log := rulesLog(func(t float64) string {
			if t < 20 {
				return "A"
			}
			return "B"
		}, nil)
		ws, _, err := Windows(strings.NewReader(log), "x.csv", rulesEntry(true), 0, cal, 1.2, "")
		if err != nil {
			t.Fatal(err)
		}
		if len(ws) != 2 || ws[0].Config != "A" || ws[1].Config != "B" || ws[0].To >= 20 || ws[1].From < 20 {
			t.Errorf("windows %+v, want A before 20 s and B after", ws)
		}
	})
	t.Run("one configuration and no column", func(t *testing.T) {
		ws, _, err := Windows(strings.NewReader(rulesLog(A, nil)), "x.csv", rulesEntry(false), 0, cal, 1.2, "only")
		if err != nil {
			t.Fatal(err)
		}
		if len(ws) != 1 || ws[0].Config != "only" {
			t.Errorf("windows %+v, want one of configuration \"only\"", ws)
		}
	})
	t.Run("a small negative speed reads 0", func(t *testing.T) {
		_, tr, err := Windows(strings.NewReader(rulesLog(A, func(float64) float64 { return -1.5 })), "x.csv", rulesEntry(false), 0, cal, 1.2, "only")
		if err != nil {
			t.Fatal(err)
		}
		if len(tr) == 0 {
			t.Fatal("no trace")
		}
		for _, p := range tr {
			if p.SpeedKmh != 0 {
				t.Fatalf("trace speed %g km/h at %g s, want 0", p.SpeedKmh, p.T)
			}
		}
	})
	t.Run("a speed below -2 km/h", func(t *testing.T) {
		sp := func(t float64) float64 {
			if t == 5 {
				return -2.5
			}
			return 100
		}
		_, _, err := Windows(strings.NewReader(rulesLog(A, sp)), "x.csv", rulesEntry(false), 0, cal, 1.2, "only")
		// t = 5.0 s is row i = 50, line 52 after the header; its speed
		// cell starts after "5.0,", at column 5.
		var pe *logs.ParseError
		if !errors.As(err, &pe) || !errors.Is(err, campaign.ErrRange) || pe.Line != 52 || pe.Column != 5 {
			t.Errorf("error %v, want a range error at line 52, column 5", err)
		}
	})
	t.Run("the trace's moving average", func(t *testing.T) {
		_, tr, err := Windows(strings.NewReader(rulesLog(A, nil)), "x.csv", rulesEntry(false), 0, cal, 1.2, "only")
		if err != nil {
			t.Fatal(err)
		}
		ma := NewMovingAverage(5) // τ 0.5 s at 10 Hz
		k := 0
		for i := range 400 {
			h := 10 * (1 + 0.01*math.Sin(float64(i)))
			avg := h
			if i > 0 {
				avg = ma.Step(h)
			}
			if k < len(tr) && tr[k].T == float64(i)/10 {
				if tr[k].MovingAverage != avg {
					t.Fatalf("trace point %d: moving average %g, want %g", k, tr[k].MovingAverage, avg)
				}
				k++
			}
		}
		if k != len(tr) || k == 0 {
			t.Errorf("matched %d of %d trace points", k, len(tr))
		}
	})
}
