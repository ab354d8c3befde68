package steady

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestBandAdmits: the steady-window rule (model.md, "Steady windows":
// every sample within ±tol of the window mean), worked by hand on a band
// of 100 and 101 km/h (mean 100.5) with tol = 1 km/h.
func TestBandAdmits(t *testing.T) {
	tests := []struct {
		name string
		v    float64
		want bool
	}{
		{"inside", 100.5, true},
		{"new mean 101: 100 is 1.0 below, on the edge", 102, true},
		{"new mean 101.33: 100 is 1.33 below", 103, false},
		{"new mean 99.33: 101 is 1.67 above", 97, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var b Band
			b.Add(100)
			b.Add(101)
			if got := b.Admits(tt.v, 1); got != tt.want {
				t.Errorf("Admits(%g) = %v, want %v", tt.v, got, tt.want)
			}
		})
	}
	var empty Band
	if !empty.Admits(1e9, 0) || empty.Mean() != 0 {
		t.Errorf("an empty band must admit anything and have mean 0")
	}
}

// refBand keeps every sample and applies the band's rule to them afresh
// (slices.Max and Min, whose NaN and signed-zero rules are the builtins'):
// the reference that TestBandComparisons holds Band's running extremes to.
type refBand struct{ xs []float64 }

func (r *refBand) sum() float64 {
	s := 0.0
	for _, x := range r.xs {
		s += x
	}
	return s
}

func (r *refBand) admits(v, tol float64) bool {
	if len(r.xs) == 0 {
		return true
	}
	all := append(r.xs[:len(r.xs):len(r.xs)], v)
	n, sum := float64(len(all)), r.sum()+v
	return n*slices.Max(all)-sum <= n*tol && sum-n*slices.Min(all) <= n*tol
}

// TestBandComparisons: Band answers as the reference with min and max on
// every sample of streams that mix speeds with NaN, ±0 and ±Inf, fed as a
// window finder feeds it (a sample not admitted starts a new band) and
// also added regardless; seeded.
func TestBandComparisons(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	special := []float64{math.NaN(), 0, math.Copysign(0, -1), math.Inf(1), math.Inf(-1)}
	for _, tc := range []struct {
		name   string
		always bool // add every sample, admitted or not
	}{{"as a finder feeds it", false}, {"every sample added", true}} {
		t.Run(tc.name, func(t *testing.T) {
			for stream := range 200 {
				var b Band
				var r refBand
				for i := range 300 {
					v := 100 + 3*rng.NormFloat64()
					if rng.IntN(20) == 0 {
						v = special[rng.IntN(len(special))]
					}
					got, want := b.Admits(v, 1.5), r.admits(v, 1.5)
					if got != want {
						t.Fatalf("stream %d sample %d: Admits(%g) = %v, reference %v", stream, i, v, got, want)
					}
					if !got && !tc.always {
						b, r = Band{}, refBand{}
					}
					b.Add(v)
					r.xs = append(r.xs, v)
					if m, rm := b.Mean(), r.sum()/float64(len(r.xs)); m != rm && !(math.IsNaN(m) && math.IsNaN(rm)) {
						t.Fatalf("stream %d sample %d: Mean %g, reference %g", stream, i, m, rm)
					}
				}
			}
		})
	}
}
