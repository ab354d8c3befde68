package fuse

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/dsp/fourier"
	"gonum.org/v1/gonum/stat/distuv"
)

// Convergence diagnostics of Vehtari, Gelman, Simpson, Carpenter & Bürkner,
// "Rank-normalization, folding, and localization: an improved R̂ for
// assessing convergence of MCMC", Bayesian Analysis 16 (2021) 667–718.

// splitChains cuts each chain in half (dropping a middle draw of an odd
// length), doubling the chains.
func splitChains(chains [][]float64) [][]float64 {
	out := make([][]float64, 0, 2*len(chains))
	for _, c := range chains {
		h := len(c) / 2
		out = append(out, c[:h], c[len(c)-h:])
	}
	return out
}

// rankNormalize replaces every draw by the normal score of its pooled
// fractional rank, Φ⁻¹((r − 3/8)/(S + 1/4)), ties getting their average rank.
func rankNormalize(chains [][]float64) [][]float64 {
	type item struct {
		v    float64
		c, i int
	}
	var all []item
	for c, ch := range chains {
		for i, v := range ch {
			all = append(all, item{v, c, i})
		}
	}
	sort.Slice(all, func(a, b int) bool { return all[a].v < all[b].v })
	S := float64(len(all))
	out := make([][]float64, len(chains))
	for c, ch := range chains {
		out[c] = make([]float64, len(ch))
	}
	for lo := 0; lo < len(all); {
		hi := lo
		for hi+1 < len(all) && all[hi+1].v == all[lo].v {
			hi++
		}
		r := float64(lo+hi)/2 + 1
		z := distuv.UnitNormal.Quantile((r - 0.375) / (S + 0.25))
		for k := lo; k <= hi; k++ {
			out[all[k].c][all[k].i] = z
		}
		lo = hi + 1
	}
	return out
}

// basicRhat is the potential scale reduction √(V̂⁺/W) of Gelman & Rubin.
func basicRhat(chains [][]float64) float64 {
	M := float64(len(chains))
	n := float64(len(chains[0]))
	if n < 2 {
		return math.NaN()
	}
	var means []float64
	var W float64
	for _, c := range chains {
		m, v := meanVar(c)
		means = append(means, m)
		W += v / M
	}
	_, B := meanVar(means) // B/n
	if W == 0 {
		return 1
	}
	vplus := (n-1)/n*W + B
	return math.Sqrt(vplus / W)
}

// meanVar returns the mean and the unbiased variance.
func meanVar(x []float64) (float64, float64) {
	var m float64
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	var s float64
	for _, v := range x {
		s += (v - m) * (v - m)
	}
	if len(x) < 2 {
		return m, 0
	}
	return m, s / float64(len(x)-1)
}

// Rhat returns the rank-normalised split R̂: the larger of the R̂ of the
// rank-normalised split chains and of their folded (|x − median|) version.
func Rhat(chains [][]float64) float64 {
	split := splitChains(chains)
	bulk := basicRhat(rankNormalize(split))
	med := median(split)
	folded := make([][]float64, len(split))
	for i, c := range split {
		folded[i] = make([]float64, len(c))
		for j, v := range c {
			folded[i][j] = math.Abs(v - med)
		}
	}
	return math.Max(bulk, basicRhat(rankNormalize(folded)))
}

func median(chains [][]float64) float64 {
	var all []float64
	for _, c := range chains {
		all = append(all, c...)
	}
	sort.Float64s(all)
	return quantileSorted(all, 0.5)
}

// ESSBulk returns the bulk effective sample size: the ESS of the
// rank-normalised split chains, with autocorrelations combined across
// chains and truncated by Geyer's initial monotone sequence.
func ESSBulk(chains [][]float64) float64 {
	return ess(rankNormalize(splitChains(chains)))
}

func ess(chains [][]float64) float64 {
	M := len(chains)
	n := len(chains[0])
	if n < 4 {
		return float64(M * n)
	}
	acovs := make([][]float64, M)
	var W float64
	means := make([]float64, M)
	for c, ch := range chains {
		acovs[c] = autocov(ch)
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
	rho := func(t int) float64 {
		var a float64
		for c := range chains {
			a += acovs[c][t]
		}
		a /= float64(M)
		return 1 - (W-a)/vplus
	}
	tau := -1.0
	prev := math.Inf(1)
	for k := 0; 2*k+1 < n; k++ {
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

// autocov returns the biased autocovariances (divided by n) of x at every
// lag, by FFT with zero padding.
func autocov(x []float64) []float64 {
	n := len(x)
	m, _ := meanVar(x)
	size := 1
	for size < 2*n {
		size <<= 1
	}
	fft := fourier.NewFFT(size)
	buf := make([]float64, size)
	for i, v := range x {
		buf[i] = v - m
	}
	coef := fft.Coefficients(nil, buf)
	for i, c := range coef {
		coef[i] = complex(real(c)*real(c)+imag(c)*imag(c), 0)
	}
	ac := fft.Sequence(nil, coef)
	out := make([]float64, n)
	for i := range out {
		out[i] = ac[i] / float64(size) / float64(n)
	}
	// Unbiased-variance scaling at lag 0 to match meanVar's convention.
	out0 := out[0]
	if out0 != 0 {
		_, v := meanVar(x)
		scale := v * float64(n-1) / float64(n) / out0
		for i := range out {
			out[i] *= scale
		}
	}
	return out
}

// quantileSorted returns the p-quantile of sorted data by linear
// interpolation between order statistics (Hyndman & Fan type 7).
func quantileSorted(x []float64, p float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	h := (float64(len(x)) - 1) * p
	lo := math.Floor(h)
	i := int(lo)
	if i+1 >= len(x) {
		return x[len(x)-1]
	}
	return x[i] + (h-lo)*(x[i+1]-x[i])
}
