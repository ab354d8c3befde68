// Package evidence is the seam between the method adapters and fusion: the
// Evidence each adapter fills and package fuse reads. It imports nothing else
// of liftfuse.
package evidence

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// WindName is the nuisance name of the along-road wind of the campaign's one
// session; every entry whose airspeed it changes declares it with the same
// prior, so fusion sees one wind.
const WindName = "wind"

// Axles of the lift parameters; AxleTotal is front plus rear.
const (
	AxleFront = "front"
	AxleRear  = "rear"
	AxleTotal = "total"
)

// RefSpeedKmh is V_ref of the linear speed model,
// β(V) = β + γ·(V − V_ref)/V_ref, and of tyre growth.
const RefSpeedKmh = 100.0

// Kind names a measurement method; the strings are those of the result
// document's "kind" field.
type Kind string

// The method kinds of format 1.
const (
	KindRideHeight Kind = "ride_height"
	KindPressure   Kind = "pressure"
	KindVortex     Kind = "vortex"
)

// Evidence is what one method entry says about the lift parameters, in the
// one currency that fusion understands. It is the seam between the adapters
// (which know sensors, logs and taps) and package fuse (which knows only
// this type).
//
// The lift parameters β are C_L·A of one axle of one configuration, in m²
// (SAE J1594 axle lift; lift positive upward). A Gaussian observation is
//
//	y = s · (Σ_k w_k · β_k(V)) · q(w) + Σ_j c_j · ν_j + ε
//
// where w_k are the Terms, s the product of the observation's scale factors
// (each log-normal with median 1: stiffness, calibration gain, integration
// scale), q(w) the dynamic pressure at the airspeed (see Airspeed), ν_j the
// named additive nuisances with their priors (static offset, tyre growth,
// reference offset, drift, …; Gaussian, flat, or log-normal for a positive
// quantity stated to within a factor, the pitch of drag) and c_j their
// coefficients, and ε zero-mean
// Gaussian with the covariance of the observation's Block (full within a
// block, independent between blocks).
//
// A sign observation is the observed sense of Σ_k w_k β_k(V):
//
//	P(observed lift sense) = ε + (1 − 2ε)·Φ(Σ w β / τ)
//
// with ε the misread probability and τ the softness in m².
//
// With the linear speed model, fusion expands β_k(V) = β_k + γ_k·(V − V_ref)/V_ref
// (V_ref = 100 km/h) using the observation's airspeed; adapters never see γ.
//
// Names of nuisances and scale groups are global: the same name in two
// Evidence values is the same quantity (a wind shared by the entries of a
// session, say), and its prior must then be declared identically. Adapters
// prefix entry-specific names with the entry id.
type Evidence struct {
	Entry string // the evidence entry's id
	Kind  Kind

	Blocks    []Block
	Signs     []Sign
	Nuisances []Nuisance
	Scales    []ScaleGroup

	// Informs lists the quantities this entry speaks of, for its standalone
	// result and agreement check: for each configuration, front, rear or
	// total.
	Informs []Quantity
	// Warnings are things a person should look at, found while reducing.
	Warnings []string
}

// Term is the weight of one lift parameter in an observation.
type Term struct {
	Config string
	Axle   string // AxleFront or AxleRear
	W      float64
}

// Quantity is an axle (front, rear or total) of a configuration.
type Quantity struct {
	Config string
	Axle   string // AxleFront, AxleRear or AxleTotal
}

// Airspeed says how the dynamic pressure of an observation depends on the
// along-road wind w, a nuisance named Wind with a Gaussian prior:
//
//	q(w) = Q + ρ·Dir·V·w + ½·ρ·w²
//
// which is the mean of ½ρ(V_i + Dir·w)² over the samples when Q is the mean
// of ½ρV_i² and V their mean ground speed. Dir is +1 or −1 for the travel
// direction; 0 means not logged, and fusion then uses E[q] = Q + ½ρσ_w² and
// adds the wind's share to the observation's variance. An empty Wind means
// no wind term.
type Airspeed struct {
	Q    float64 // mean dynamic pressure at ground speed, Pa
	V    float64 // mean ground speed, m/s
	Rho  float64 // air density, kg/m³
	Dir  float64 // +1, −1, or 0 (unknown)
	Wind string  // name of the wind nuisance, or ""
}

// ScaleRef names a scale group and the power with which it multiplies the
// lift term: the term is multiplied by s_g^Pow. Most references have Pow 1;
// a laser's compliance depends on springs and tyres in series, so each
// enters with the fraction of compliance it carries (first order in logs).
type ScaleRef struct {
	Name string
	Pow  float64
}

// Coef is the coefficient of a named additive nuisance. With PerQ set the
// nuisance's effect is proportional to the dynamic pressure, like the lift
// itself (a patch's Cp, the pitch of drag): the coefficient is then
// C·q(w)/Q, so that wind scales it as it scales the lift.
type Coef struct {
	Name string
	C    float64
	PerQ bool
}

// Obs is one Gaussian observation.
type Obs struct {
	Y      float64
	Terms  []Term
	Air    Airspeed
	Scales []ScaleRef // scale groups multiplying the lift term: s = Π s_g^Pow
	Nuis   []Coef
	Label  string // what it is, for the report ("window 3 at 101 km/h")
}

// Block is a set of observations with their error covariance (units of
// y²): a full matrix Cov, or, for independent errors, their variances Var
// alone (Cov nil), so that memory grows with the observations, not their
// square.
type Block struct {
	Obs []Obs
	Cov *mat.SymDense
	Var []float64
}

// At returns element (i, j) of the block's covariance.
func (b Block) At(i, j int) float64 {
	if b.Cov != nil {
		return b.Cov.At(i, j)
	}
	if i == j {
		return b.Var[i]
	}
	return 0
}

// Sign is one observed sense of a lift quantity.
type Sign struct {
	Terms    []Term
	Air      Airspeed // only V is used (speed model), Q is kept for the report
	Lift     bool     // true when the lift sense was observed
	Misread  float64  // ε in [0, 0.5)
	Softness float64  // τ > 0, m²
	Label    string
}

// UnitCp is the unit of a nuisance that is a pressure coefficient (an
// uncovered patch's Cp): explanations hold it within what a surface can
// read, −3 to 1.05.
const UnitCp = "Cp"

// Nuisance is a named additive nuisance with a Gaussian prior N(Mean, SD²),
// a flat prior when Flat is set (a static offset, say), or a log-normal
// prior when LogNormal is set.
type Nuisance struct {
	Name  string
	Label string // in plain words, for notes: "rear laser tyre growth"
	Unit  string // for notes: "mm at 100 km/h"; UnitCp for a pressure coefficient
	Mean  float64
	SD    float64
	Flat  bool
	// LogNormal marks a positive quantity stated to within a factor (the
	// pitch of drag from a stated C_D·A ± sd_pct): ν = Mean·s with
	// log s ~ N(0, SD²), so Mean is the median and SD the log-sd (0: ν is
	// Mean exactly). Its coefficients are read as for any nuisance, C·ν;
	// fusion carries log s as a non-linear parameter like a scale group's.
	// It is not a wind.
	LogNormal bool
	// PerRun marks a nuisance that belongs to one set of runs (a log's
	// static offset and drift, the day's wind): repeating the runs brings a
	// fresh copy of it, where a shared error (springs, gain, tyre growth,
	// reference port, method scale) stays the same and does not average
	// down. Planning reads it.
	PerRun bool
}

// ScaleGroup is a multiplicative factor s with a log-normal prior of median 1:
// log s ~ N(0, SD²). SD = 0 means the factor is exactly 1.
type ScaleGroup struct {
	Name  string
	Label string
	SD    float64
}

// ErrBadEvidence is wrapped by every error of Check.
var ErrBadEvidence = errors.New("malformed evidence")

func badf(format string, args ...any) error {
	return fmt.Errorf("%w: %s", ErrBadEvidence, fmt.Sprintf(format, args...))
}

func finite(xs ...float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// NewBlock checks that cov is a finite, symmetric positive-definite n×n
// matrix for n observations and returns the block.
func NewBlock(obs []Obs, cov *mat.SymDense) (Block, error) {
	if len(obs) == 0 {
		return Block{}, badf("empty block")
	}
	if cov == nil || cov.SymmetricDim() != len(obs) {
		return Block{}, badf("covariance of a block of %d observations has the wrong size", len(obs))
	}
	for i := range len(obs) {
		for j := range len(obs) {
			if !finite(cov.At(i, j)) {
				return Block{}, badf("covariance has a non-finite element")
			}
		}
	}
	var chol mat.Cholesky
	if ok := chol.Factorize(cov); !ok {
		return Block{}, badf("covariance of %q… is not positive definite", obs[0].Label)
	}
	return Block{Obs: obs, Cov: cov}, nil
}

// Diagonal returns a block of independent observations with the given
// standard deviations.
func Diagonal(obs []Obs, sd []float64) (Block, error) {
	if len(sd) != len(obs) {
		return Block{}, badf("%d observations but %d standard deviations", len(obs), len(sd))
	}
	if len(obs) == 0 {
		return Block{}, badf("empty block")
	}
	v := make([]float64, len(sd))
	for i, s := range sd {
		if !finite(s) || !(s > 0) {
			return Block{}, badf("standard deviation of %q is %g; it must be positive and finite", obs[i].Label, s)
		}
		v[i] = s * s
	}
	return Block{Obs: obs, Var: v}, nil
}

// checkNuisances checks the declared nuisances and returns their names
// and, by name, whether each is log-normal.
func (e *Evidence) checkNuisances() (nuis, logn map[string]bool, err error) {
	nuis, logn = map[string]bool{}, map[string]bool{}
	for _, n := range e.Nuisances {
		if n.Name == "" || nuis[n.Name] {
			return nil, nil, badf("entry %q: nuisance %q empty or declared twice", e.Entry, n.Name)
		}
		switch {
		case n.LogNormal && (n.Flat || !(n.Mean > 0) || !finite(n.Mean, n.SD) || n.SD < 0):
			return nil, nil, badf("entry %q: log-normal nuisance %q needs a positive finite median and a finite log-sd ≥ 0", e.Entry, n.Name)
		case !n.LogNormal && (!finite(n.Mean, n.SD) || (!n.Flat && n.SD <= 0)):
			return nil, nil, badf("entry %q: nuisance %q needs a finite mean and a positive sd", e.Entry, n.Name)
		}
		nuis[n.Name], logn[n.Name] = true, n.LogNormal
	}
	return nuis, logn, nil
}

// item names an observation or a sign in Check's messages; it is written
// out only for a message (Check runs on every fusion's evidence, and
// formatting each label up front was most of its time).
type item struct{ kind, label string }

func (it item) String() string { return fmt.Sprintf("%s %q", it.kind, it.label) }

// Check reports the first way in which e is malformed: non-finite numbers,
// terms on unknown axles, undeclared or inconsistently declared nuisances and
// scale groups, bad probabilities, empty evidence. Adapters call it before
// handing evidence on; fusion calls it again.
func (e *Evidence) Check() error {
	if e.Entry == "" {
		return badf("no entry id")
	}
	if len(e.Blocks) == 0 && len(e.Signs) == 0 {
		return badf("entry %q has no observations", e.Entry)
	}
	nuis, logn, err := e.checkNuisances()
	if err != nil {
		return err
	}
	scales := map[string]bool{}
	for _, s := range e.Scales {
		if s.Name == "" || scales[s.Name] {
			return badf("entry %q: scale group %q empty or declared twice", e.Entry, s.Name)
		}
		if !finite(s.SD) || s.SD < 0 {
			return badf("entry %q: scale group %q needs a finite sd ≥ 0", e.Entry, s.Name)
		}
		scales[s.Name] = true
	}
	checkTerms := func(what item, ts []Term, air Airspeed) error {
		if len(ts) == 0 {
			return badf("entry %q: %s sees no lift parameter", e.Entry, what)
		}
		for _, t := range ts {
			if t.Config == "" || (t.Axle != AxleFront && t.Axle != AxleRear) || !finite(t.W) {
				return badf("entry %q: %s has a bad term %+v", e.Entry, what, t)
			}
		}
		if !finite(air.Q, air.V, air.Rho, air.Dir) || air.Q < 0 || air.V < 0 || air.Rho < 0 {
			return badf("entry %q: %s has a bad airspeed %+v", e.Entry, what, air)
		}
		if air.Wind != "" && !nuis[air.Wind] {
			return badf("entry %q: %s names undeclared wind %q", e.Entry, what, air.Wind)
		}
		if air.Wind != "" && logn[air.Wind] {
			return badf("entry %q: %s names log-normal nuisance %q as its wind", e.Entry, what, air.Wind)
		}
		return nil
	}
	for bi, b := range e.Blocks {
		if (b.Cov == nil) == (b.Var == nil) || b.Cov != nil && b.Cov.SymmetricDim() != len(b.Obs) || b.Var != nil && len(b.Var) != len(b.Obs) {
			return badf("entry %q: block %d covariance has the wrong size", e.Entry, bi)
		}
		for _, o := range b.Obs {
			what := item{"observation", o.Label}
			if !finite(o.Y) {
				return badf("entry %q: %s is not finite", e.Entry, what)
			}
			if err := checkTerms(what, o.Terms, o.Air); err != nil {
				return err
			}
			for _, s := range o.Scales {
				if !scales[s.Name] || !finite(s.Pow) {
					return badf("entry %q: %s names undeclared scale group %q", e.Entry, what, s.Name)
				}
			}
			for _, c := range o.Nuis {
				if !nuis[c.Name] || !finite(c.C) {
					return badf("entry %q: %s names undeclared nuisance %q", e.Entry, what, c.Name)
				}
			}
		}
	}
	for _, s := range e.Signs {
		what := item{"sign", s.Label}
		if err := checkTerms(what, s.Terms, s.Air); err != nil {
			return err
		}
		if !(s.Misread >= 0 && s.Misread < 0.5) || !(s.Softness > 0) || !finite(s.Softness) {
			return badf("entry %q: %s needs misread in [0, 0.5) and softness > 0", e.Entry, what)
		}
	}
	return nil
}
