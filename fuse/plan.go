package fuse

import (
	"fmt"
	"math"
	"sort"

	"liftfuse/methods/evidence"
)

// PlanFormat is the format string of the plan document.
const PlanFormat = "liftfuse.plan/1"

// Target is what a plan tries to pin down: an axle (front, rear or total)
// of a configuration, or its difference to another configuration.
type Target struct {
	Config string   `json:"config"`
	Axle   string   `json:"axle"`
	Versus string   `json:"versus,omitempty"`
	Now    Estimate `json:"now"`
}

// terms returns the target as terms on β.
func (t Target) terms() []evidence.Term {
	ts := []evidence.Term{{Config: t.Config, Axle: t.Axle, W: 1}}
	if t.Versus != "" {
		ts = append(ts, evidence.Term{Config: t.Versus, Axle: t.Axle, W: -1})
	}
	return ts
}

func (t Target) String() string {
	if t.Versus != "" {
		return fmt.Sprintf("%s %s − %s %s", t.Config, t.Axle, t.Versus, t.Axle)
	}
	return t.Config + " " + t.Axle
}

// PlanOption is what repeating one evidence entry's runs once would buy.
type PlanOption struct {
	Entry      string  `json:"entry"`
	Kind       string  `json:"kind"`
	CostH      float64 `json:"cost_h"`
	SDAfter    float64 `json:"sd_after"`
	RemovedPct float64 `json:"variance_removed_pct"`
	PerHour    float64 `json:"per_hour"`
	Why        string  `json:"why"`
}

// Detectability is what a ride-height entry can resolve.
type Detectability struct {
	Entry          string  `json:"entry"`
	Axle           string  `json:"axle"`
	ResolvableN100 float64 `json:"resolvable_n_at_100kmh"`
	SpeedForTarget float64 `json:"speed_kmh_for_target"`
}

// Discriminator names the repeat that would best tell whether a suspect
// entry is off.
type Discriminator struct {
	Flagged string `json:"flagged"`
	Repeat  string `json:"repeat"`
	Why     string `json:"why"`
}

// Plan is the plan document, format liftfuse.plan/1.
type Plan struct {
	Format        string          `json:"format"`
	Target        Target          `json:"target"`
	Options       []PlanOption    `json:"options"`
	Detectability []Detectability `json:"detectability"`
	Discriminate  []Discriminator `json:"discriminate,omitempty"`
	// Headline and DownWeighted say which fusion the plan starts from
	// (see Result.Headline).
	Headline     string   `json:"headline,omitempty"`
	DownWeighted []string `json:"down_weighted,omitempty"`
}

// PlanRepeats ranks every entry by the variance of the target it would
// remove if its runs were repeated once, per hour of cost. cost maps an
// entry id to hours (missing: 1 h).
//
// The expected posterior after a repeat adds the repeat's Fisher
// information, at today's posterior mean, in the space of every parameter
// (lift, nuisances, scale factors, winds):
//
//	C' = (C⁻¹ + I_rep)⁻¹,   I_rep = Σ_blocks Jᵀ Σ⁻¹ J  (+ signs' Bernoulli information)
//
// with J the Jacobian of the entry's observation means. A repeat shares the
// entry's systematic errors (springs, gain, tyre growth, reference port,
// method scale), whose columns stay those of today's parameters, so they do
// not average down; what belongs to one set of runs (a log's offset and
// drift, the day's wind) comes new with the repeat and is integrated out:
// I_eff = I_xx − I_xn (I_nn + P_n)⁻¹ I_nx, P_n the prior precision of the new
// copies. For a linear-Gaussian campaign this is exact (Chaloner &
// Verdinelli, "Bayesian experimental design: a review", Statistical Science
// 10 (1995) 273 — from memory, for the form of the expected information).
//
// Planning starts from the headline posterior: the robust fusion's when
// some entry looks off, so that a repeat's worth is judged against figures
// that entry does not drag.
func (f *Fused) PlanRepeats(t Target, cost func(entry string) float64) (*Plan, error) {
	P := f.Posterior
	now, _ := P.Linear(t.terms()...)
	t.Now = now
	pl := &Plan{Format: PlanFormat, Target: t, Options: []PlanOption{}, Detectability: []Detectability{}}
	if f.Result != nil {
		pl.Headline, pl.DownWeighted = f.Result.Headline, f.Result.DownWeighted
	}
	w := P.weights(t.terms())
	m := P.p.m
	for e, id := range m.entries {
		after, err := P.repeatVar(e, w)
		if err != nil {
			return nil, fmt.Errorf("planning a repeat of %q: %w", id, err)
		}
		v0 := now.SD * now.SD
		removed := 0.0
		if v0 > 0 {
			removed = math.Max(0, 100*(v0-after)/v0)
		}
		h := cost(id)
		pl.Options = append(pl.Options, PlanOption{Entry: id, Kind: string(m.kinds[e]), CostH: h, SDAfter: math.Sqrt(math.Max(after, 0)),
			RemovedPct: removed, PerHour: removed / h, Why: m.why(e, t, removed)})
	}
	sort.SliceStable(pl.Options, func(i, j int) bool { return pl.Options[i].PerHour > pl.Options[j].PerHour })
	for _, mr := range f.Result.Methods {
		if ag := mr.Agreement; ag != nil && ag.Suspect && ag.Worst != nil {
			if d := f.discriminate(mr.ID, *ag.Worst, cost); d != nil {
				pl.Discriminate = append(pl.Discriminate, *d)
			}
		}
	}
	return pl, nil
}

// why says in plain words why a repeat helps much or little.
func (m *model) why(e int, t Target, removed float64) string {
	sees := false
	for _, q := range m.informs(e) {
		axle := t.Axle == evidence.AxleTotal || q.Axle == t.Axle || q.Axle == evidence.AxleTotal
		if axle && (q.Config == t.Config || q.Config == t.Versus) {
			sees = true
		}
	}
	var shared []string
	for _, p := range m.phi {
		if p.owners[e] && !p.perRun {
			shared = append(shared, p.label)
		}
	}
	for _, p := range m.lin {
		if p.kind == kindNuisance && p.owners[e] && !p.nuis.PerRun {
			shared = append(shared, p.nuis.Label)
		}
	}
	switch {
	case !sees:
		return "it does not see the target's axle and configurations"
	case removed < 10 && len(shared) > 0:
		return fmt.Sprintf("its error is mostly systematic and a repeat shares it (%s): calibrate instead of repeating", joinMax(shared, 3))
	case removed < 10:
		return "the other entries already pin the target; a repeat adds little"
	case removed >= 30:
		return "its error is mostly random scatter, which a repeat averages down"
	}
	return "a repeat averages down its random scatter; its shared systematic errors remain"
}

func joinMax(ss []string, n int) string {
	if len(ss) > n {
		ss = append(ss[:n:n], fmt.Sprintf("and %d more", len(ss)-n))
	}
	out := ""
	for i, s := range ss {
		if i > 0 {
			out += ", "
		}
		out += s
	}
	return out
}

// informs lists the quantities an entry of the model speaks of.
func (m *model) informs(e int) []evidence.Quantity {
	seen := map[evidence.Quantity]bool{}
	var out []evidence.Quantity
	add := func(refs []entryRef) {
		for _, r := range refs {
			p := m.lin[r.col]
			if q := (evidence.Quantity{Config: p.config, Axle: p.axle}); !seen[q] {
				seen[q] = true
				out = append(out, q)
			}
		}
	}
	for _, r := range m.rows {
		if r.entry == e {
			add(r.lift)
		}
	}
	for _, s := range m.signs {
		if s.entry == e {
			add(s.lift)
		}
	}
	return out
}

// discriminate names the repeat that would most narrow the disagreement
// of a suspect entry on its worst quantity: repeating the entry narrows its
// own side, repeating another entry narrows the others' side.
func (f *Fused) discriminate(id string, worst Disagreement, cost func(string) float64) *Discriminator {
	alone, others := f.Standalone[id], f.Others[id]
	if alone == nil || others == nil {
		return nil
	}
	q := []evidence.Term{{Config: worst.Config, Axle: worst.Axle, W: 1}}
	ea, _ := alone.Linear(q...)
	eo, _ := others.Linear(q...)
	best, bestGain := "", 0.0
	try := func(P *Posterior, entry string, other float64) {
		e := P.p.m.entryIndex(entry)
		if e < 0 {
			return
		}
		v, err := P.repeatVar(e, P.weights(q))
		if err != nil {
			return
		}
		now := ea.SD*ea.SD + eo.SD*eo.SD
		gain := (now - (v + other)) / now / cost(entry)
		if gain > bestGain {
			best, bestGain = entry, gain
		}
	}
	try(alone, id, eo.SD*eo.SD)
	for _, other := range others.p.m.entries {
		try(others, other, ea.SD*ea.SD)
	}
	if best == "" {
		return nil
	}
	why := fmt.Sprintf("repeating %s narrows the disagreement on %s %s most per hour (by %.0f %% of its variance per hour)", best, worst.Config, worst.Axle, 100*bestGain)
	if best == id {
		why += "; if the repeat agrees with the first runs and still not with the others, suspect a systematic error of " + id
	}
	return &Discriminator{Flagged: id, Repeat: best, Why: why}
}
