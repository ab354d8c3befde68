package fuse

import (
	"cmp"
	"math"
	"slices"
	"sync"

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

// scratch holds the buffers of one diagnosis or estimate, reused through
// a pool: the sampler diagnoses several quantities after every batch.
type scratch struct {
	vals, z, fz, folded []float64
	// scores[r−1] is the normal score of rank r among scoresN values
	scores         []float64
	scoresN        int
	keys, k2       []uint64
	idx, i2, order []int32
	count          [6][2048]int32 // argsort's digit counts
	// draws holds one estimate's draws (Posterior.estimate): a result
	// reports some three hundred figures, each from every draw of the
	// fused posterior, which fresh buffers cleared and faulted in one by
	// one
	draws []float64
}

var scratchPool = sync.Pool{New: func() any { return new(scratch) }}

func grow[T any](s []T, n int) []T {
	if cap(s) < n {
		return make([]T, n)
	}
	return s[:n]
}

// pooledOrder returns the pooled draws and their ascending order.
func (sc *scratch) pooledOrder(chains [][]float64) ([]float64, []int32) {
	sc.vals = sc.vals[:0]
	for _, ch := range chains {
		sc.vals = append(sc.vals, ch...)
	}
	return sc.vals, sc.argsort(sc.vals)
}

// argsort returns the indices that sort vals ascending (vals hold no NaN),
// equal values in their order in vals: an LSD radix sort on the
// order-preserving bit pattern of each float, in six passes of 11 bits
// (the last of 9; a pass whose digit is the same everywhere is skipped,
// such as the sign's and exponent's of draws in one binade), which for
// the few thousand draws diagnosed here beats a comparison sort. The digits'
// counts do not depend on the order, so all six are taken in one pass
// over the keys, not one before each pass.
func (sc *scratch) argsort(vals []float64) []int32 {
	const bits, passes = 11, 6
	const mask = 1<<bits - 1
	n := len(vals)
	keys, idx := grow(sc.keys, n), grow(sc.idx, n)
	k2, i2 := grow(sc.k2, n), grow(sc.i2, n)
	count := &sc.count
	clear(count[:])
	for i, v := range vals {
		b := math.Float64bits(v)
		if b>>63 == 1 {
			b = ^b // negative: reverse the order of magnitudes
		} else {
			b |= 1 << 63
		}
		keys[i], idx[i] = b, int32(i)
		count[0][b&mask]++
		count[1][(b>>bits)&mask]++
		count[2][(b>>(2*bits))&mask]++
		count[3][(b>>(3*bits))&mask]++
		count[4][(b>>(4*bits))&mask]++
		count[5][b>>(5*bits)]++
	}
	for p := range passes {
		shift, c := uint(bits*p), &count[p]
		if n == 0 || c[(keys[0]>>shift)&mask] == int32(n) {
			continue
		}
		var sum int32
		for d, k := range c {
			c[d] = sum
			sum += k
		}
		for i, k := range keys {
			d := (k >> shift) & mask
			k2[c[d]], i2[c[d]] = k, idx[i]
			c[d]++
		}
		keys, k2 = k2, keys
		idx, i2 = i2, idx
	}
	sc.keys, sc.k2, sc.idx, sc.i2 = keys, k2, idx, i2
	return idx
}

// normalScores gives each value the normal score of its average rank,
// given the values' ascending order, into *dst. The scores of whole ranks
// are tabulated once per number of values (every quantity of a diagnosis
// has as many draws).
func (sc *scratch) normalScores(vals []float64, idx []int32, dst *[]float64) []float64 {
	S := float64(len(vals))
	if sc.scoresN != len(vals) {
		sc.scores = grow(sc.scores, len(vals))
		for i := range sc.scores {
			sc.scores[i] = distuv.UnitNormal.Quantile((float64(i+1) - 0.375) / (S + 0.25))
		}
		sc.scoresN = len(vals)
	}
	z := grow(*dst, len(vals))
	for lo := 0; lo < len(idx); {
		hi := lo
		for hi+1 < len(idx) && vals[idx[hi+1]] == vals[idx[lo]] {
			hi++
		}
		var q float64
		if (lo+hi)%2 == 0 {
			q = sc.scores[(lo+hi)/2]
		} else {
			r := float64(lo+hi)/2 + 1
			q = distuv.UnitNormal.Quantile((r - 0.375) / (S + 0.25))
		}
		for k := lo; k <= hi; k++ {
			z[idx[k]] = q
		}
		lo = hi + 1
	}
	*dst = z
	return z
}

// reshape cuts pooled values back into chains of the given lengths.
func reshape(z []float64, chains [][]float64) [][]float64 {
	out := make([][]float64, len(chains))
	off := 0
	for c, ch := range chains {
		out[c] = z[off : off+len(ch)]
		off += len(ch)
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

// RhatESS returns the rank-normalised split R̂ and the bulk ESS together.
// The draws are sorted once: the folded values |x − median| are ordered by
// merging the two halves of that order, outward from the median.
func RhatESS(chains [][]float64) (rhat, essBulk float64) {
	sc := scratchPool.Get().(*scratch)
	defer scratchPool.Put(sc)
	split := splitChains(chains)
	vals, idx := sc.pooledOrder(split)
	z := reshape(sc.normalScores(vals, idx, &sc.z), split)
	n := len(idx)
	var med float64
	if n%2 == 1 {
		med = vals[idx[n/2]]
	} else {
		med = 0.5 * (vals[idx[n/2-1]] + vals[idx[n/2]])
	}
	folded := grow(sc.folded, n)
	for i, v := range vals {
		folded[i] = math.Abs(v - med)
	}
	sc.folded = folded
	// Below the median the order of |x − med| is the reverse of x's.
	cut, _ := slices.BinarySearchFunc(idx, med, func(i int32, t float64) int { return cmp.Compare(vals[i], t) })
	order := sc.order[:0]
	i, j := cut-1, cut
	for i >= 0 || j < n {
		if j >= n || (i >= 0 && folded[idx[i]] <= folded[idx[j]]) {
			order = append(order, idx[i])
			i--
		} else {
			order = append(order, idx[j])
			j++
		}
	}
	sc.order = order
	fz := reshape(sc.normalScores(folded, order, &sc.fz), split)
	return math.Max(basicRhat(z), basicRhat(fz)), ess(z)
}

// ess is the effective sample size of (rank-normalised, split) chains,
// with autocorrelations combined across chains and truncated by Geyer's
// initial monotone sequence.
func ess(chains [][]float64) float64 {
	M := len(chains)
	n := len(chains[0])
	if n < 4 {
		return float64(M * n)
	}
	a := newAutocorr(chains)
	if a.vplus == 0 {
		return float64(M * n)
	}
	// Autocovariances are computed directly lag by lag, as the truncation
	// usually comes after a few lags; past directLags, all at once by FFT.
	const directLags = 64
	tau := -1.0
	prev := math.Inf(1)
	for k := 0; 2*k+1 < n; k++ {
		if 2*k+1 >= directLags && a.acovs == nil {
			a.byFFT()
		}
		r0, r1 := a.pair(2 * k)
		p := r0 + r1
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

// autocorr gives the autocorrelations of chains combined across them,
// ρ_t = 1 − (W − ā_t)/var⁺ with ā_t the chains' mean autocovariance at
// lag t (Vehtari et al. 2021, the bulk ESS).
type autocorr struct {
	chains   [][]float64
	means    []float64
	acovs    [][]float64 // every lag of each chain, by FFT (byFFT); nil: summed directly
	w, vplus float64     // mean within-chain variance W and var⁺
}

// newAutocorr returns the chains' autocorrelations, summed directly.
func newAutocorr(chains [][]float64) *autocorr {
	M, n := len(chains), len(chains[0])
	a := &autocorr{chains: chains, means: make([]float64, M)}
	for c, ch := range chains {
		m, v := meanVar(ch)
		a.means[c] = m
		a.w += v / float64(M)
	}
	a.vplus = a.w * float64(n-1) / float64(n)
	if M > 1 {
		_, b := meanVar(a.means)
		a.vplus += b
	}
	return a
}

// byFFT computes every lag's autocovariance of each chain at once.
func (a *autocorr) byFFT() {
	fft := fourier.NewFFT(fftSize(len(a.chains[0])))
	a.acovs = make([][]float64, len(a.chains))
	for c, ch := range a.chains {
		a.acovs[c] = autocov(fft, ch)
	}
}

// pair returns the autocorrelations at lags t and t + 1, which Geyer's
// sequence always takes together: one pass over each chain sums both,
// each in its own order (that of one lag alone).
func (a *autocorr) pair(t int) (float64, float64) {
	M, n := len(a.chains), len(a.chains[0])
	var a0, a1 float64
	for c, ch := range a.chains {
		if a.acovs != nil {
			a0 += a.acovs[c][t]
			a1 += a.acovs[c][t+1]
			continue
		}
		m := a.means[c]
		var s0, s1 float64
		s0 += (ch[t] - m) * (ch[0] - m)
		for i := t + 1; i < n; i++ {
			s0 += (ch[i] - m) * (ch[i-t] - m)
			s1 += (ch[i] - m) * (ch[i-t-1] - m)
		}
		a0 += s0 / float64(n)
		a1 += s1 / float64(n)
	}
	a0 /= float64(M)
	a1 /= float64(M)
	return 1 - (a.w-a0)/a.vplus, 1 - (a.w-a1)/a.vplus
}

// fftSize is the zero-padded FFT length for autocovariances of n draws.
func fftSize(n int) int {
	size := 1
	for size < 2*n {
		size <<= 1
	}
	return size
}

// autocov returns the biased autocovariances (divided by n) of x at every
// lag, by FFT with zero padding (fft of length fftSize(len(x))).
func autocov(fft *fourier.FFT, x []float64) []float64 {
	n := len(x)
	m, _ := meanVar(x)
	size := fft.Len()
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

// quantileSelect is quantileSorted of x sorted, found by selecting the two
// order statistics it interpolates between; x is reordered.
func quantileSelect(x []float64, p float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	h := (float64(len(x)) - 1) * p
	lo := math.Floor(h)
	i := int(lo)
	xi := selectKth(x, i)
	if i+1 >= len(x) {
		return xi
	}
	next := slices.Min(x[i+1:]) // after selection, the larger values
	return xi + (h-lo)*(next-xi)
}

// selectKth reorders x so that x[k] is its k-th smallest value (0-based),
// with nothing larger before it and nothing smaller after (Hoare's
// selection, "FIND", CACM 4 (1961) 321 — from memory; median-of-three
// pivots), and returns x[k]. x holds no NaN.
func selectKth(x []float64, k int) float64 {
	lo, hi := 0, len(x)-1
	for hi > lo {
		mid := lo + (hi-lo)/2
		if x[mid] < x[lo] {
			x[mid], x[lo] = x[lo], x[mid]
		}
		if x[hi] < x[lo] {
			x[hi], x[lo] = x[lo], x[hi]
		}
		if x[hi] < x[mid] {
			x[hi], x[mid] = x[mid], x[hi]
		}
		pivot := x[mid]
		i, j := lo, hi
		for i <= j {
			for x[i] < pivot {
				i++
			}
			for x[j] > pivot {
				j--
			}
			if i <= j {
				x[i], x[j] = x[j], x[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return x[k]
		}
	}
	return x[k]
}
