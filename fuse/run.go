package fuse

import (
	"fmt"

	"liftfuse/methods/evidence"
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
	// Checks are the adapters' tripped model checks, carried into
	// Result.Checks and, one line each, into Result.Warnings.
	Checks []Check
}

// Fused holds the posteriors behind a Result, for charts and planning.
// Posterior is the headline's: the robust fusion's when the result's
// headline is robust, else the plain one's, which Plain always holds.
type Fused struct {
	Posterior  *Posterior
	Plain      *Posterior
	Standalone map[string]*Posterior
	Others     map[string]*Posterior
	Result     *Result

	full *model              // the plain joint model
	loo  map[string]*looStat // each entry's leave-one-out statistic, for Diagnose
}

// Run fuses every entry, computes each entry's standalone posterior and its
// agreement with the others, and fills the result document (all but the
// campaign's title, hash and tool version, which the caller knows). The
// steps, in order: the joint fit; the configurations' results; the deltas
// to the reference; the leave-one-out fits; the robust refit of the others
// where some entry looks off; the entries' results and agreement; the
// robust headline where some entry looks off; the headline posterior's
// sampler diagnostics.
// Warnings are appended in that order, after the caller's warnings and
// checks.
func Run(in Input) (*Fused, error) {
	set := in.Settings.withDefaults()
	set.reference = in.Reference
	full, err := newModel(in.Evidence, set)
	if err != nil {
		return nil, err
	}
	P, err := full.fit()
	if err != nil {
		return nil, err
	}
	res := &Result{Format: ResultFormat, Credible: set.Credible, Air: AirInfo{DensityKgM3: in.Rho, Method: "CIPM-2007"},
		Configs: []ConfigResult{}, Deltas: []DeltaResult{}, Methods: []MethodResult{}, Warnings: append([]string{}, in.Warnings...),
		Headline: HeadlinePlain, DownWeighted: []string{}}
	res.AddChecks(in.Checks)
	out := &Fused{Posterior: P, Plain: P, Standalone: map[string]*Posterior{}, Others: map[string]*Posterior{}, Result: res,
		full: full, loo: map[string]*looStat{}}

	configResults(res, P, in, set)
	deltaResults(res, P, in.Reference, set.Configs)
	lo, err := leaveOneOut(full, P, in.Evidence)
	if err != nil {
		return nil, err
	}
	if err := lo.refinePOff(P.p.logZ); err != nil {
		return nil, err
	}
	if err := lo.robustOthers(in.Evidence); err != nil {
		return nil, err
	}
	lo.compactRefitted(in.Evidence)
	methodResults(res, out, in.Evidence, lo)
	if err := robustHeadline(out, full, in, set, lo); err != nil {
		return nil, err
	}
	res.Diagnostics = diagnostics(res, out.Posterior)
	return out, nil
}

// configResults appends each configuration's fused result (see
// configResult), computed two configurations at a time. A configuration no
// evidence speaks of is marked prior-only, with a warning.
func configResults(res *Result, P *Posterior, in Input, set Settings) {
	if P.p.gaussian {
		P.seriesOf(nil) // a closed form's draws, made once before they are shared
	}
	crs := make([]ConfigResult, len(set.Configs))
	parallel(len(crs), func(i int) { crs[i] = configResult(P, set.Configs[i], in) })
	for _, cr := range crs {
		if cr.PriorOnly {
			res.Warnings = append(res.Warnings, fmt.Sprintf("configuration %q: no evidence speaks of it; its figures are the prior (0 ± %g m²) alone", cr.ID, set.PriorSD))
		}
		res.Configs = append(res.Configs, cr)
	}
}

// configResult is a configuration's fused result: the front, rear and
// total C_L·A, the front share β_f/β_t, the axle forces q(V)·β(V) at the
// report speeds (q = ½ρV²) and, given a frontal area A, the SAE J1594
// coefficients C_L = C_L·A / A.
func configResult(P *Posterior, c string, in Input) ConfigResult {
	cr := ConfigResult{ID: c, PriorOnly: !P.p.m.informed[c]}
	cr.Front = axle(P, c, evidence.AxleFront)
	cr.Rear = axle(P, c, evidence.AxleRear)
	cr.Total = axle(P, c, evidence.AxleTotal)
	cr.FrontShare = P.Ratio([]evidence.Term{{Config: c, Axle: evidence.AxleFront, W: 1}}, []evidence.Term{{Config: c, Axle: evidence.AxleTotal, W: 1}})
	for _, v := range in.SpeedsKmh {
		cr.AtSpeeds = append(cr.AtSpeeds, atSpeed(P, c, v, in.Rho))
	}
	if A := in.FrontalAreaM2; A > 0 {
		cr.SAE = &SAECoefficients{FrontalAreaM2: A, CLF: cr.Front.CLA.Scale(1 / A), CLR: cr.Rear.CLA.Scale(1 / A), CL: cr.Total.CLA.Scale(1 / A)}
	}
	return cr
}

// atSpeed returns a configuration's axle forces q(V)·β(V) at a speed V in
// km/h (q = ½ρV²) and P(β(V) < 0): with the linear speed model both use
// β(V) = β + γ·(V − V_ref)/V_ref at that speed, never β at V_ref.
func atSpeed(P *Posterior, config string, v, rho float64) SpeedResult {
	q := dynamicPressure(rho, v)
	sr := SpeedResult{SpeedKmh: v}
	for _, ax := range []struct {
		name string
		n    *Estimate
		p    *float64
	}{{evidence.AxleFront, &sr.FrontN, &sr.PDownforce.Front}, {evidence.AxleRear, &sr.RearN, &sr.PDownforce.Rear}, {evidence.AxleTotal, &sr.TotalN, &sr.PDownforce.Total}} {
		*ax.n, *ax.p = P.At(v, evidence.Term{Config: config, Axle: ax.name, W: q})
	}
	return sr
}

// deltaResults appends every configuration's difference to the reference,
// β_c − β_ref on each axle, with P(difference < 0).
func deltaResults(res *Result, P *Posterior, reference string, configs []string) {
	for _, c := range configs {
		if c == reference {
			continue
		}
		d := DeltaResult{Config: c, Versus: reference}
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal} {
			e, pn := P.Delta(c, reference, ax)
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
}

// methodResults appends each entry's standalone estimates and, with more
// than one entry, its agreement with the others (named a suspect, with a
// warning, when p < suspectP or P(off) > flagOff); it records the leave-one-out
// posteriors in out.
func methodResults(res *Result, out *Fused, evs []evidence.Evidence, lo *looFits) {
	ags, sts := agreements(evs, lo)
	for ei, ev := range evs {
		mr := MethodResult{ID: ev.Entry, Kind: string(ev.Kind), Standalone: standalone(lo.alone[ei], ev)}
		out.Standalone[ev.Entry] = lo.alone[ei]
		if len(evs) > 1 {
			O := lo.others[ei]
			out.Others[ev.Entry] = O
			ag, st := ags[ei], sts[ei]
			out.loo[ev.Entry] = st
			ag.POff = lo.pOff[ei]
			ag.judge()
			if ag.Suspect {
				res.Warnings = append(res.Warnings, ag.Warning(ev.Entry))
			}
			mr.Agreement = ag
		}
		res.Methods = append(res.Methods, mr)
	}
	if len(evs) == 1 {
		res.Warnings = append(res.Warnings, "a single evidence entry: nothing to check it against, so no agreement figures")
	}
}

// agreements computes every entry's agreement with the others (none with
// a single entry), two entries at a time: each reads its own others'
// posterior (leaveout.go).
func agreements(evs []evidence.Evidence, lo *looFits) ([]*Agreement, []*looStat) {
	ags, sts := make([]*Agreement, len(evs)), make([]*looStat, len(evs))
	if len(evs) < 2 {
		return ags, sts
	}
	parallel(len(evs), func(ei int) {
		ags[ei], sts[ei] = lo.agreement(ei, evs[ei])
	})
	return ags, sts
}

// diagnostics returns how the fused posterior was computed, warning when a
// sampled posterior's R̂ exceeds 1.01 or its bulk ESS is below 400 (Vehtari
// et al. 2021's thresholds).
func diagnostics(res *Result, P *Posterior) *DiagnosticsDoc {
	d := P.Diagnostics()
	doc := &DiagnosticsDoc{Sampler: d.Sampler, Draws: d.Draws, Seed: d.Seed}
	if !P.p.gaussian {
		r, e := d.RhatMax, d.ESSMin
		doc.RhatMax, doc.ESSMin = &r, &e
		if r > 1.01 || e < 400 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("sampler diagnostics are poor (R̂ %.3f, ESS %.0f): treat the intervals with care", r, e))
		}
	}
	return doc
}

func axle(P *Posterior, config, ax string) AxleResult {
	e, pn := P.Quantity(evidence.Quantity{Config: config, Axle: ax})
	return AxleResult{CLA: e, PDownforce: pn}
}

// Standalone returns a result document with only each entry's standalone
// estimates filled (what `reduce --json` prints).
func Standalone(evs []evidence.Evidence, set Settings) (*Result, error) {
	set = set.withDefaults()
	res := &Result{Format: ResultFormat, Credible: set.Credible, Configs: []ConfigResult{}, Deltas: []DeltaResult{}, Warnings: []string{},
		DownWeighted: []string{}, Checks: []Check{}}
	for _, ev := range evs {
		one := set
		one.track = ev.Informs // the quantities it reports
		alone, err := Fit([]evidence.Evidence{ev}, one)
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
