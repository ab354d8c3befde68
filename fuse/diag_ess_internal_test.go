package fuse

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// TestESSPairs: ess, which sums the autocovariances of lags 2k and 2k + 1
// in one pass, equals to the bit the lag-by-lag sums it replaced
// (essLagByLag, below), on split chains of AR(1) draws from independent
// to so correlated that the sequence runs past the direct lags into the
// FFT, of even and odd lengths.
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
		{"past the direct lags", 0.995, 300},
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
			got, want := ess(chains), essLagByLag(chains)
			if math.Float64bits(got) != math.Float64bits(want) {
				t.Errorf("ess %v, lag by lag %v", got, want)
			}
		})
	}
}

// essLagByLag is ess summing each lag on its own, the reference.
func essLagByLag(chains [][]float64) float64 {
	M := len(chains)
	n := len(chains[0])
	if n < 4 {
		return float64(M * n)
	}
	var W float64
	means := make([]float64, M)
	for c, ch := range chains {
		m, v := meanVar(ch)
		means[c] = m
		W += v / float64(M)
	}
	vplus := W * float64(n-1) / float64(n)
	if M > 1 {
		_, b := meanVar(means)
		vplus += b
	}
	if vplus == 0 {
		return float64(M * n)
	}
	// Autocovariances are computed directly lag by lag, as the truncation
	// usually comes after a few lags; past directLags, all at once by FFT.
	const directLags = 64
	var acovs [][]float64
	rho := func(t int) float64 {
		var a float64
		for c, ch := range chains {
			if acovs != nil {
				a += acovs[c][t]
				continue
			}
			var s float64
			for i := t; i < n; i++ {
				s += (ch[i] - means[c]) * (ch[i-t] - means[c])
			}
			a += s / float64(n)
		}
		a /= float64(M)
		return 1 - (W-a)/vplus
	}
	tau := -1.0
	prev := math.Inf(1)
	for k := 0; 2*k+1 < n; k++ {
		if 2*k+1 >= directLags && acovs == nil {
			fft := fourier.NewFFT(fftSize(n))
			acovs = make([][]float64, M)
			for c, ch := range chains {
				acovs[c] = autocov(fft, ch)
			}
		}
		p := rho(2*k) + rho(2*k+1)
		if p < 0 {
			break
		}
		p = math.Min(p, prev)
		prev = p
		tau += 2 * p
	}
	S := float64(M * n)
	tau = math.Max(tau, 1/math.Log10(S))
	return S / tau
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
