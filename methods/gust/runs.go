package gust

// Stop is the ground speed (km/h) below which a window is a standstill,
// which ends a run.
const Stop = 5.0

// Key is what splits observations, in time order, into runs: a new run
// begins when the configuration or the direction changes, after a
// standstill, or after a gap in time of more than MaxGapS.
type Key struct {
	Log       int
	Config    string
	Direction int
	SpeedKmh  float64
	From, To  float64 // s
}

// MaxGapS is the longest pause between two windows of one run (s).
const MaxGapS = 60.0

// Runs groups the indices of keys (given in time order within each log)
// into runs. Standstill windows belong to no run.
func Runs(keys []Key) [][]int {
	var out [][]int
	var cur []int
	var last Key
	flush := func() {
		if len(cur) > 0 {
			out = append(out, cur)
		}
		cur = nil
	}
	for i, k := range keys {
		if k.SpeedKmh < Stop {
			flush()
			continue
		}
		if len(cur) > 0 && (k.Log != last.Log || k.Config != last.Config || k.Direction != last.Direction || k.From-last.To > MaxGapS) {
			flush()
		}
		cur = append(cur, i)
		last = k
	}
	flush()
	return out
}
