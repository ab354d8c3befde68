package reality

import (
	"hash/fnv"
	"math"
	"math/rand/v2"
)

// stream returns the random stream of one named purpose of a seeded day,
// so that adding a sensor or a tap does not change any other draw.
func stream(seed int64, name string) *rand.Rand {
	h := fnv.New64a()
	h.Write([]byte(name))
	return rand.New(rand.NewPCG(uint64(seed), h.Sum64()))
}

// ar1 is a stationary AR(1) noise of standard deviation sd:
// x_k = φ·x_{k−1} + √(1 − φ²)·sd·e_k.
type ar1 struct {
	phi, sd, x float64
	r          *rand.Rand
	started    bool
}

func newAR1(r *rand.Rand, sd, phi float64) *ar1 { return &ar1{phi: phi, sd: sd, r: r} }

func (n *ar1) next() float64 {
	if n.sd == 0 {
		return 0
	}
	if !n.started {
		n.x, n.started = n.sd*n.r.NormFloat64(), true
		return n.x
	}
	n.x = n.phi*n.x + math.Sqrt(1-n.phi*n.phi)*n.sd*n.r.NormFloat64()
	return n.x
}

// logNormal returns exp(N(0, (pct/100)²)): a stated value's factor.
func logNormal(r *rand.Rand, pct float64) float64 {
	return math.Exp(pct / 100 * r.NormFloat64())
}
