package fuse

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/air"
	"liftfuse/methods/evidence"
)

// Robust layer: each entry's errors may be inflated by κ with prior
// probability offPrior (model.md, "Agreement").
const (
	kappa    = 5.0
	offPrior = 0.05
	// flagP and flagOff are the agreement flag's thresholds
	// (result-format.md): p-value below 0.05, or P(off) above 0.5.
	flagP   = 0.05
	flagOff = 0.5
)

// Input is what a campaign-level fusion needs, all of it already reduced by
// the adapters.
type Input struct {
	Evidence      []evidence.Evidence
	Settings      Settings
	Reference     string    // reference configuration of the deltas
	SpeedsKmh     []float64 // report speeds
	Rho           float64   // air density for forces at the report speeds
	FrontalAreaM2 float64   // 0: no SAE coefficients
	Warnings      []string  // carried into the result
}

// Fused holds the posteriors behind a Result, for charts and planning.
type Fused struct {
	Posterior  *Posterior
	Standalone map[string]*Posterior
	Others     map[string]*Posterior
	Result     *Result
}

// Run fuses every entry, computes each entry's standalone posterior and its
// agreement with the others, and fills the result document (all but the
// campaign's title, hash and tool version, which the caller knows).
func Run(in Input) (*Fused, error) {
	set := in.Settings.withDefaults()
	full, err := newModel(in.Evidence, set)
	if err != nil {
		return nil, err
	}
	P, err := full.fit()
	if err != nil {
		return nil, err
	}
	res := &Result{Format: ResultFormat, Credible: set.Credible, Air: AirInfo{DensityKgM3: in.Rho, Method: "CIPM-2007"},
		Configs: []ConfigResult{}, Deltas: []DeltaResult{}, Methods: []MethodResult{}, Warnings: append([]string{}, in.Warnings...)}
	out := &Fused{Posterior: P, Standalone: map[string]*Posterior{}, Others: map[string]*Posterior{}, Result: res}

	informed := map[string]bool{}
	for _, ev := range in.Evidence {
		for _, q := range ev.Informs {
			informed[q.Config] = true
		}
	}
	for _, c := range set.Configs {
		cr := ConfigResult{ID: c, PriorOnly: !informed[c]}
		if cr.PriorOnly {
			res.Warnings = append(res.Warnings, fmt.Sprintf("configuration %q: no evidence speaks of it; its figures are the prior (0 ± %g m²) alone", c, set.PriorSD))
		}
		cr.Front = axle(P, c, evidence.AxleFront)
		cr.Rear = axle(P, c, evidence.AxleRear)
		cr.Total = axle(P, c, evidence.AxleTotal)
		cr.FrontShare = P.Ratio([]evidence.Term{{Config: c, Axle: evidence.AxleFront, W: 1}}, []evidence.Term{{Config: c, Axle: evidence.AxleTotal, W: 1}})
		for _, v := range in.SpeedsKmh {
			q := air.DynamicPressure(in.Rho, air.KmhToMs(v))
			at := func(ax string) Estimate { e, _ := P.At(v, evidence.Term{Config: c, Axle: ax, W: q}); return e }
			cr.AtSpeeds = append(cr.AtSpeeds, SpeedResult{SpeedKmh: v, FrontN: at(evidence.AxleFront), RearN: at(evidence.AxleRear), TotalN: at(evidence.AxleTotal)})
		}
		if A := in.FrontalAreaM2; A > 0 {
			cr.SAE = &SAECoefficients{FrontalAreaM2: A, CLF: cr.Front.CLA.Scale(1 / A), CLR: cr.Rear.CLA.Scale(1 / A), CL: cr.Total.CLA.Scale(1 / A)}
		}
		res.Configs = append(res.Configs, cr)
	}
	for _, c := range set.Configs {
		if c == in.Reference {
			continue
		}
		d := DeltaResult{Config: c, Versus: in.Reference}
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal} {
			e, pn := P.Delta(c, in.Reference, ax)
			ar := AxleResult{CLA: e, PDownforce: pn}
			switch ax {
			case evidence.AxleFront:
				d.Front = ar
			case evidence.AxleRear:
				d.Rear = ar
			default:
				d.Total = ar
			}
		}
		res.Deltas = append(res.Deltas, d)
	}

	// Each entry alone, and every entry but it: independent fits, run two
	// at a time (each is seeded on its own, so the order does not matter).
	M := len(in.Evidence)
	// The others' posteriors feed only the agreement distance (a mean and a
	// covariance), never a reported interval: half the draws suffice.
	setOthers := set
	setOthers.MinESS = math.Max(400, set.MinESS/2)
	start := map[string]float64{}
	for i, p := range full.phi {
		if P.p.phiMode != nil {
			start[p.name] = P.p.phiMode[i]
		}
	}
	full.start = start
	alone := make([]*Posterior, M)
	others := make([]*Posterior, M)
	pOffs := make([]float64, M)
	errs := make([]error, 2*M)
	jobs := make(chan int)
	var wg sync.WaitGroup
	for range 2 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range jobs {
				ei := j / 2
				ev := in.Evidence[ei]
				if j%2 == 0 {
					var am *model
					am, errs[j] = newModel([]evidence.Evidence{ev}, set)
					if errs[j] == nil {
						am.start = start
						alone[ei], errs[j] = am.fit()
					}
					if errs[j] != nil {
						errs[j] = fmt.Errorf("entry %q alone: %w", ev.Entry, errs[j])
					}
					continue
				}
				if M == 1 {
					continue
				}
				rest := append(append([]evidence.Evidence(nil), in.Evidence[:ei]...), in.Evidence[ei+1:]...)
				om, err := newModel(rest, setOthers)
				if err == nil {
					om.start = start
					others[ei], err = om.fit()
				}
				if err != nil {
					errs[j] = fmt.Errorf("every entry but %q: %w", ev.Entry, err)
					continue
				}
				pOffs[ei] = full.pOff(ei, P.p.logZ)
			}
		}()
	}
	for j := range 2 * M {
		jobs <- j
	}
	close(jobs)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	// An entry that looks off would drag the others' posterior along and
	// make the good entries disagree with it: where some other entry looks
	// off, compare with the others fused with that entry's errors inflated.
	for ei, ev := range in.Evidence {
		if M == 1 {
			break
		}
		off := map[int]bool{}
		k := 0
		for j := range in.Evidence {
			if j == ei {
				continue
			}
			if pOffs[j] > flagOff {
				off[k] = true
			}
			k++
		}
		if len(off) == 0 {
			continue
		}
		rest := append(append([]evidence.Evidence(nil), in.Evidence[:ei]...), in.Evidence[ei+1:]...)
		om, err := newModel(rest, setOthers)
		if err != nil {
			return nil, err
		}
		om.start = start
		if others[ei], err = om.variant(off, true, true).fit(); err != nil {
			return nil, fmt.Errorf("every entry but %q, robustly: %w", ev.Entry, err)
		}
	}
	for ei, ev := range in.Evidence {
		mr := MethodResult{ID: ev.Entry, Kind: string(ev.Kind), Standalone: standalone(alone[ei], ev)}
		out.Standalone[ev.Entry] = alone[ei]
		if M > 1 {
			O := others[ei]
			out.Others[ev.Entry] = O
			ag := agreement(full, ei, ev, alone[ei], O)
			ag.POff = pOffs[ei]
			ag.Flag = ag.PValue < flagP || ag.POff > flagOff
			if ag.Flag {
				msg := fmt.Sprintf("entry %q disagrees with the others (distance %.2f, p = %.3g, P(off) = %.2f)", ev.Entry, ag.Distance, ag.PValue, ag.POff)
				if w := ag.Worst; w != nil {
					msg += fmt.Sprintf(": most on %s %s, by %+.3f m² (%.1f sd)", w.Config, w.Axle, w.DiffM2, w.Sigmas)
				}
				res.Warnings = append(res.Warnings, msg)
			}
			mr.Agreement = ag
		}
		res.Methods = append(res.Methods, mr)
	}
	if len(in.Evidence) == 1 {
		res.Warnings = append(res.Warnings, "a single evidence entry: nothing to check it against, so no agreement figures")
	}
	d := P.Diagnostics()
	doc := &DiagnosticsDoc{Sampler: d.Sampler, Draws: d.Draws, Seed: d.Seed}
	if !P.p.gaussian {
		r, e := d.RhatMax, d.ESSMin
		doc.RhatMax, doc.ESSMin = &r, &e
		if r > 1.01 || e < 400 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("sampler diagnostics are poor (R̂ %.3f, ESS %.0f): treat the intervals with care", r, e))
		}
	}
	res.Diagnostics = doc
	return out, nil
}

func axle(P *Posterior, config, ax string) AxleResult {
	e, pn := P.Quantity(evidence.Quantity{Config: config, Axle: ax})
	return AxleResult{CLA: e, PDownforce: pn}
}

// agreement compares entry ev's standalone posterior with the others' on
// the quantities it informs: the Mahalanobis distance
//
//	d² = Δᵀ (C_alone + C_others)⁻¹ Δ,   p = P(χ²_k > d²)
//
// (the two posteriors are independent given the prior, which is wide). For
// sign evidence it is the posterior predictive p-value of the observed
// senses under the others' posterior, with T = −Σ log P(sense | θ).
func agreement(full *model, ei int, ev evidence.Evidence, alone, others *Posterior) *Agreement {
	if len(ev.Blocks) == 0 && len(ev.Signs) > 0 {
		return signAgreement(full, ei, others)
	}
	k := len(ev.Informs)
	if k == 0 {
		return &Agreement{PValue: 1, Note: "informs no quantity"}
	}
	series := func(P *Posterior) ([][]float64, []float64) {
		xs := make([][]float64, k)
		means := make([]float64, k)
		for i, q := range ev.Informs {
			xs[i] = flatten(P.seriesOf(P.weights([]evidence.Term{{Config: q.Config, Axle: q.Axle, W: 1}})))
			means[i], _ = meanVar(xs[i])
		}
		return xs, means
	}
	xa, ma := series(alone)
	xo, mo := series(others)
	C := mat.NewSymDense(k, nil)
	for i := range k {
		for j := i; j < k; j++ {
			C.SetSym(i, j, covariance(xa[i], xa[j])+covariance(xo[i], xo[j]))
		}
	}
	diff := make([]float64, k)
	ag := &Agreement{}
	worst := -1.0
	for i := range k {
		diff[i] = ma[i] - mo[i]
		if s := math.Abs(diff[i]) / math.Sqrt(C.At(i, i)); s > worst {
			worst = s
			ag.Worst = &Disagreement{Config: ev.Informs[i].Config, Axle: ev.Informs[i].Axle, DiffM2: diff[i], Sigmas: diff[i] / math.Sqrt(C.At(i, i))}
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(C) {
		ag.PValue, ag.Note = 1, "covariance of the comparison is singular"
		return ag
	}
	dv := mat.NewVecDense(k, diff)
	var x mat.VecDense
	if err := ch.SolveVecTo(&x, dv); err != nil {
		ag.PValue, ag.Note = 1, "covariance of the comparison is singular"
		return ag
	}
	d2 := mat.Dot(dv, &x)
	ag.Distance = math.Sqrt(d2)
	ag.PValue = distuv.ChiSquared{K: float64(k)}.Survival(d2)
	return ag
}

func covariance(a, b []float64) float64 {
	ma, _ := meanVar(a)
	mb, _ := meanVar(b)
	var s float64
	for i := range a {
		s += (a[i] - ma) * (b[i] - mb)
	}
	return s / float64(len(a)-1)
}

// signAgreement is the posterior predictive check of an entry's signs
// under the others' posterior (Gelman, Meng & Stern 1996): for each draw θ
// a replicate set of senses is simulated, and p is the share of draws whose
// replicate is at least as improbable as what was observed.
func signAgreement(full *model, ei int, others *Posterior) *Agreement {
	var signs []*sign
	for i := range full.signs {
		if full.signs[i].entry == ei {
			signs = append(signs, &full.signs[i])
		}
	}
	vals := make([][]float64, len(signs))
	for i, s := range signs {
		w := append(append([]entryRef(nil), s.lift...), s.gamma...)
		vals[i] = flatten(others.seriesOf(w))
	}
	n := len(vals[0])
	rng := newRand(full.set.Seed, 777)
	extreme := 0
	for d := range n {
		var tObs, tRep float64
		for i, s := range signs {
			pUp := s.misread + (1-2*s.misread)*distuv.UnitNormal.CDF(vals[i][d]/s.softness)
			pObs := pUp
			if !s.up {
				pObs = 1 - pUp
			}
			tObs -= math.Log(math.Max(pObs, 1e-300))
			pRep := pUp
			if rng.Float64() >= pUp {
				pRep = 1 - pUp
			}
			tRep -= math.Log(math.Max(pRep, 1e-300))
		}
		if tRep >= tObs {
			extreme++
		}
	}
	p := float64(extreme) / float64(n)
	return &Agreement{PValue: p, Distance: math.Abs(distuv.UnitNormal.Quantile(math.Max(p, 1e-300) / 2)),
		Note: "posterior predictive check of the observed senses under the other entries"}
}

// pOff is the posterior probability that entry e's errors are inflated by
// κ. "Off" is either of two alternatives, equally likely: its random errors
// are κ times larger, or the priors of its own systematic errors (stiffness,
// gain, tyre growth, offsets, …) are κ times wider. From Laplace estimates
// of the evidence of each,
//
//	P(off) = π·Z_off / (π·Z_off + (1 − π)·Z),  Z_off = ½(Z_noise + Z_sys),  π = 0.05
func (m *model) pOff(e int, logZ float64) float64 {
	var logZs []float64
	for _, sys := range []bool{false, true} {
		alt := m.variant(map[int]bool{e: true}, !sys, sys)
		_, _, lz, err := alt.laplace()
		if err != nil || math.IsNaN(lz) {
			continue
		}
		logZs = append(logZs, lz)
	}
	if len(logZs) == 0 {
		return 0
	}
	// log Z_off = log ½ Σ Z_k, computed stably.
	mx := math.Inf(-1)
	for _, l := range logZs {
		mx = math.Max(mx, l)
	}
	var s float64
	for _, l := range logZs {
		s += math.Exp(l - mx)
	}
	logZoff := mx + math.Log(s/2)
	return 1 / (1 + (1-offPrior)/offPrior*math.Exp(logZ-logZoff))
}

// variant returns a copy of the model (sharing its data) with the entries
// in off inflated by κ: their random errors when noise is set, their own
// systematic priors when sys is set.
func (m *model) variant(off map[int]bool, noise, sys bool) *model {
	alt := &model{data: m.data, start: m.start}
	alt.inflate = append([]float64(nil), m.inflate...)
	alt.inflateSys = append([]float64(nil), m.inflateSys...)
	for e := range off {
		if noise {
			alt.inflate[e] = kappa
		}
		if sys {
			alt.inflateSys[e] = kappa
		}
	}
	return alt
}

// Standalone returns a result document with only each entry's standalone
// estimates filled (what `reduce --json` prints).
func Standalone(evs []evidence.Evidence, set Settings) (*Result, error) {
	set = set.withDefaults()
	res := &Result{Format: ResultFormat, Credible: set.Credible, Configs: []ConfigResult{}, Deltas: []DeltaResult{}, Warnings: []string{}}
	for _, ev := range evs {
		alone, err := Fit([]evidence.Evidence{ev}, set)
		if err != nil {
			return nil, fmt.Errorf("entry %q alone: %w", ev.Entry, err)
		}
		res.Methods = append(res.Methods, MethodResult{ID: ev.Entry, Kind: string(ev.Kind), Standalone: standalone(alone, ev)})
	}
	return res, nil
}

// standalone lists what a posterior of one entry says of the quantities the
// entry informs.
func standalone(P *Posterior, ev evidence.Evidence) []StandaloneResult {
	var out []StandaloneResult
	for _, q := range ev.Informs {
		e, pn := P.Quantity(q)
		out = append(out, StandaloneResult{Config: q.Config, Axle: q.Axle, CLA: e, PDownforce: pn})
	}
	return out
}
