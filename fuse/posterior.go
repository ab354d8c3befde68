package fuse

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sync"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/evidence"
)

// Estimate summarises a posterior: mean, standard deviation and the central
// credible interval [Lo, Hi] at the posterior's level.
type Estimate struct {
	Mean float64 `json:"mean"`
	SD   float64 `json:"sd"`
	Lo   float64 `json:"lo"`
	Hi   float64 `json:"hi"`
}

// Scale returns the estimate multiplied by k (k > 0), e.g. to newtons.
func (e Estimate) Scale(k float64) Estimate {
	return Estimate{Mean: e.Mean * k, SD: e.SD * math.Abs(k), Lo: e.Lo * k, Hi: e.Hi * k}
}

// Posterior is the joint posterior of the lift parameters given a set of
// Evidence values.
type Posterior struct {
	p     *posterior
	level float64
	// joint draws for non-linear summaries of a closed-form posterior,
	// made on first use
	gdraws []*drawStore

	// the joint moments over (θ, φ), computed on first use (joint.go)
	mu    sync.Mutex
	jmean []float64
	jcov  *mat.SymDense
	// compacted: the draws of the nuisance columns were dropped (compact);
	// refit makes them again, into whole
	compacted bool
	kept      []int // the columns of θ a compacted posterior kept, ascending
	refit     func() (*Posterior, error)
	whole     *Posterior
}

// Fit computes the posterior of the evidence under the settings.
func Fit(evs []evidence.Evidence, set Settings) (*Posterior, error) {
	m, err := newModel(evs, set)
	if err != nil {
		return nil, err
	}
	return m.fit()
}

func (m *model) fit() (*Posterior, error) {
	p, err := m.sample()
	if err != nil {
		return nil, err
	}
	return &Posterior{p: p, level: m.set.Credible}, nil
}

// Diagnostics returns how the posterior was computed.
func (P *Posterior) Diagnostics() Diagnostics { return P.p.diag }

// weights turns terms on (configuration, axle) into column weights at
// V_ref; a "total" axle counts front and rear.
func (P *Posterior) weights(ts []evidence.Term) []entryRef {
	return P.weightsAt(math.NaN(), ts)
}

// weightsAt is weights at a speed vKmh: with the linear speed model each β
// brings its γ with weight (V − V_ref)/V_ref.
func (P *Posterior) weightsAt(vKmh float64, ts []evidence.Term) []entryRef {
	m := P.p.m
	var w []entryRef
	for _, t := range ts {
		for _, r := range m.quantity(evidence.Quantity{Config: t.Config, Axle: t.Axle}) {
			w = append(w, entryRef{r.col, r.v * t.W})
			if m.set.Linear && !math.IsNaN(vKmh) {
				w = append(w, entryRef{m.gammaOf(r.col), r.v * t.W * (vKmh - evidence.RefSpeedKmh) / evidence.RefSpeedKmh})
			}
		}
	}
	return w
}

// At returns the estimate of Σ W·β(V) at a speed in km/h (with the
// constant speed model, the same as Linear), and P(value < 0).
func (P *Posterior) At(vKmh float64, ts ...evidence.Term) (Estimate, float64) {
	return P.estimate(P.weightsAt(vKmh, ts))
}

// Linear returns the estimate of Σ W·β over the terms (axle "total" allowed)
// and P(Σ W·β < 0).
func (P *Posterior) Linear(ts ...evidence.Term) (Estimate, float64) {
	return P.estimate(P.weights(ts))
}

func (P *Posterior) estimate(w []entryRef) (Estimate, float64) {
	if P.p.gaussian {
		mean, sd := P.p.gaussMoments(w)
		z := distuv.UnitNormal.Quantile(0.5 + P.level/2)
		pneg := 1.0
		if sd > 0 {
			pneg = distuv.UnitNormal.CDF(-mean / sd)
		} else if mean > 0 {
			pneg = 0
		}
		return Estimate{Mean: mean, SD: sd, Lo: mean - z*sd, Hi: mean + z*sd}, pneg
	}
	sc := scratchPool.Get().(*scratch)
	pooled := P.p.pooledInto(w, sc.draws)
	e, pneg := summarizeOwned(pooled, P.level)
	sc.draws = pooled
	scratchPool.Put(sc)
	return e, pneg
}

// Quantity returns the estimate of an axle (front, rear or total) of a
// configuration, and P(downforce).
func (P *Posterior) Quantity(q evidence.Quantity) (Estimate, float64) {
	return P.Linear(evidence.Term{Config: q.Config, Axle: q.Axle, W: 1})
}

// Delta returns the estimate of an axle of config minus the same axle of
// versus, and P(difference < 0).
func (P *Posterior) Delta(config, versus, axle string) (Estimate, float64) {
	return P.Linear(Target{Config: config, Axle: axle, Versus: versus}.terms()...)
}

// Ratio returns the estimate of num/den (e.g. the front share β_f/β_t) from
// joint draws. Draws with a zero denominator are left out.
func (P *Posterior) Ratio(num, den []evidence.Term) Estimate {
	a := flatten(P.seriesOf(P.weights(num)))
	b := flatten(P.seriesOf(P.weights(den)))
	r := make([]float64, 0, len(a))
	for i := range a {
		if b[i] != 0 {
			r = append(r, a[i]/b[i])
		}
	}
	e, _ := summarizeOwned(r, P.level)
	return e
}

// Draws returns pooled draws of Σ W·β (for charts and checks).
func (P *Posterior) Draws(ts ...evidence.Term) []float64 {
	return flatten(P.seriesOf(P.weights(ts)))
}

// seriesOf returns chain-wise draws, making joint Gaussian draws for a
// closed-form posterior on first use (seeded, so output is reproducible;
// under P.mu, so that concurrent readers make them once).
func (P *Posterior) seriesOf(w []entryRef) [][]float64 {
	if P.compacted {
		return P.compactSeries(w)
	}
	if !P.p.gaussian {
		return P.p.series(w)
	}
	P.mu.Lock()
	if P.gdraws == nil {
		P.gdraws = P.p.gaussDraws()
	}
	P.mu.Unlock()
	out, _ := storesSeries(P.gdraws, P.gdraws[0].n, w, nil)
	return out
}

// compactSeries is seriesOf on a compacted posterior: its stores hold the
// kept columns in order, so each column of θ is looked up in P.kept; a
// combination that reads a column not kept comes from the refit.
func (P *Posterior) compactSeries(w []entryRef) [][]float64 {
	at := make([]entryRef, len(w))
	for i, e := range w {
		k, ok := slices.BinarySearch(P.kept, e.col)
		if !ok {
			P.mu.Lock()
			W := P.wholeLocked()
			P.mu.Unlock()
			if W == nil { // no refit: nothing sound to return (as jointMoments)
				out, _ := P.p.seriesInto(nil, nil)
				for _, c := range out {
					for j := range c {
						c[j] = math.NaN()
					}
				}
				return out
			}
			return W.seriesOf(w)
		}
		at[i] = entryRef{k, e.v}
	}
	return P.p.series(at)
}

// gaussDraws makes 2000 draws per chain from a closed-form posterior,
// chain c seeded with stream 101 + c.
func (p *posterior) gaussDraws() []*drawStore {
	np := len(p.m.lin)
	const n = 2000
	out := make([]*drawStore, nChains)
	for c := range out {
		rng := rand.New(rand.NewPCG(p.m.set.Seed, uint64(c)+101))
		d := newDrawStore(np)
		z, theta := make([]float64, np), make([]float64, np)
		for range n {
			for j := range z {
				z[j] = rng.NormFloat64()
			}
			p.cond.draw(z, theta)
			d.add(theta)
		}
		out[c] = d
	}
	return out
}

// gaussMoments returns the exact mean and sd of wᵀθ under the closed form.
func (p *posterior) gaussMoments(w []entryRef) (float64, float64) {
	n := len(p.m.lin)
	a := make([]float64, n)
	for _, t := range w {
		a[t.col] += t.v
	}
	var mean float64
	for i, v := range a {
		mean += v * p.cond.mean[i]
	}
	return mean, math.Sqrt(math.Max(0, p.cond.quad(a)))
}

func flatten(chains [][]float64) []float64 {
	n := 0
	for _, c := range chains {
		n += len(c)
	}
	out := make([]float64, 0, n)
	for _, c := range chains {
		out = append(out, c...)
	}
	return out
}

// summarizeOwned returns mean, sd, central interval and P(x < 0) of draws
// it may reorder. The two quantiles are found by selection rather than a
// full sort (the same order statistics, in linear time).
func summarizeOwned(x []float64, level float64) (Estimate, float64) {
	if len(x) == 0 {
		nan := math.NaN()
		return Estimate{nan, nan, nan, nan}, nan
	}
	m, v := meanVar(x)
	neg := 0
	for _, xi := range x {
		if xi < 0 {
			neg++
		}
	}
	return Estimate{Mean: m, SD: math.Sqrt(v), Lo: quantileSelect(x, 0.5-level/2), Hi: quantileSelect(x, 0.5+level/2)},
		float64(neg) / float64(len(x))
}

// Fitted returns, for each Gaussian observation of an entry in evidence
// order, its expected value at the posterior mean of every parameter: the
// fitted line of the entry's data, for charts.
func (P *Posterior) Fitted(entry string) ([]float64, error) {
	m := P.p.m
	e := m.entryIndex(entry)
	if e < 0 {
		return nil, fmt.Errorf("no entry %q in this posterior", entry)
	}
	mean := P.jointMean()
	p := len(m.lin)
	var out []float64
	var buf []entryRef
	for bi := range m.blocks {
		if m.blocks[bi].entry != e {
			continue
		}
		for _, ri := range m.blocks[bi].rows {
			out = append(out, m.rowMean(&m.rows[ri], mean[:p], mean[p:], buf))
		}
	}
	return out, nil
}
