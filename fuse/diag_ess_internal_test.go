package fuse

import (
	"math"
	"testing"
)

// TestESSPairs: autocorr.pair, which sums the autocovariances of lags t
// and t + 1 in one pass, equals to the bit each lag summed on its own
// (single, below, the lag-by-lag sum it replaced), at every even lag,
// summed directly and from the FFT's autocovariances, on split chains of
// AR(1) draws from independent to sticky, of even and odd lengths. A pair
// that reads the FFT's lag t twice, or sums a lag in another order, fails
// it.
func TestESSPairs(t *testing.T) {
	rng := newRand(9, 1)
	for _, tc := range []struct {
		name string
		phi  float64
		n    int
	}{
		{"independent", 0, 500},
		{"mixing", 0.5, 661},
		{"sticky", 0.9, 400},
		{"short", 0.3, 5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			chains := make([][]float64, 8)
			for c := range chains {
				x := rng.NormFloat64()
				for range tc.n {
					x = tc.phi*x + math.Sqrt(1-tc.phi*tc.phi)*rng.NormFloat64()
					chains[c] = append(chains[c], x)
				}
			}
			a := newAutocorr(chains)
			for _, path := range []string{"direct", "FFT"} {
				if path == "FFT" {
					a.byFFT()
				}
				for lag := 0; lag+1 < tc.n; lag += 2 {
					r0, r1 := a.pair(lag)
					w0, w1 := a.single(lag), a.single(lag+1)
					if math.Float64bits(r0) != math.Float64bits(w0) || math.Float64bits(r1) != math.Float64bits(w1) {
						t.Fatalf("%s, lags %d and %d: %v, %v; each alone %v, %v", path, lag, lag+1, r0, r1, w0, w1)
					}
				}
			}
		})
	}
}

// single is the autocorrelation at lag t alone, the reference.
func (a *autocorr) single(t int) float64 {
	M, n := len(a.chains), len(a.chains[0])
	var s float64
	for c, ch := range a.chains {
		if a.acovs != nil {
			s += a.acovs[c][t]
			continue
		}
		var d float64
		for i := t; i < n; i++ {
			d += (ch[i] - a.means[c]) * (ch[i-t] - a.means[c])
		}
		s += d / float64(n)
	}
	s /= float64(M)
	return 1 - (a.w-s)/a.vplus
}

// TestESSAutoregressive: the bulk ESS of chains from a stationary AR(1)
// process x_t = ρ·x_{t−1} + √(1−ρ²)·ε_t is M·n/τ with the integrated
// autocorrelation time τ = 1 + 2·Σ_{k≥1} ρ^k = (1 + ρ)/(1 − ρ), the
// autocorrelation at lag k being ρ^k (a geometric series: textbook time
// series algebra, e.g. Box & Jenkins, AR(1) autocorrelation function —
// from memory). Four chains of 50 000 draws, from independent to
// correlated past the direct lags (ρ = 0.97: τ ≈ 66, the sequence runs
// into the FFT). The estimate's own scatter is a few per cent at these
// lengths (seeded; here within 0.2–6 %); 15 % allows three of it. A
// within-chain variance not averaged over the chains, or τ summing the
// pairs once instead of twice, fails it; the between-chain term is not
// exercised (the chains are stationary from their first draw).
func TestESSAutoregressive(t *testing.T) {
	rng := newRand(11, 3)
	for _, tc := range []struct {
		name string
		rho  float64
	}{
		{"independent", 0},
		{"mixing", 0.5},
		{"sticky", 0.9},
		{"past the direct lags", 0.97},
	} {
		t.Run(tc.name, func(t *testing.T) {
			const M, n = 4, 50000
			chains := make([][]float64, M)
			for c := range chains {
				x := rng.NormFloat64()
				chains[c] = make([]float64, n)
				for i := range chains[c] {
					x = tc.rho*x + math.Sqrt(1-tc.rho*tc.rho)*rng.NormFloat64()
					chains[c][i] = x
				}
			}
			want := M * n * (1 - tc.rho) / (1 + tc.rho)
			if got := ess(chains); math.Abs(got/want-1) > 0.15 {
				t.Errorf("ESS %.0f, want %.0f (τ = %.1f) within 15 %%", got, want, (1+tc.rho)/(1-tc.rho))
			}
		})
	}
}
