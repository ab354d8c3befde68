package fuse

import "gonum.org/v1/gonum/stat/distuv"

// sign is one sign observation in indexed form: an observer saw the sense
// (up or down) of a quantity x = aᵀθ, with x = Σ_k w_k·(β_k + γ_k·vfac).
// Its probability of reporting "up" is the probit with misreading
//
//	P(up | x) = ε + (1 − 2ε)·Φ(x/τ)
//
// with ε the misread probability and τ the softness (common practice, no
// source: a probit link with a lapse rate).
type sign struct {
	lift     []entryRef
	gamma    []entryRef
	all      []entryRef // lift then gamma: the weights a of x = aᵀθ
	up       bool
	misread  float64
	softness float64
	entry    int
	label    string
	v        float64
}

// refs returns the weights a of the sign's quantity x = aᵀθ, β columns
// then γ columns.
func (s *sign) refs() []entryRef { return s.all }

// value returns x = aᵀθ.
func (s *sign) value(theta []float64) float64 {
	var x float64
	for _, t := range s.all {
		x += t.v * theta[t.col]
	}
	return x
}

// probit returns ε + (1 − 2ε)·Φ(z): P(up) at a standardised value z.
func (s *sign) probit(z float64) float64 {
	return s.misread + (1-2*s.misread)*distuv.UnitNormal.CDF(z)
}

// pUp returns P(up | x) = ε + (1 − 2ε)·Φ(x/τ).
func (s *sign) pUp(x float64) float64 { return s.probit(x / s.softness) }

// dpUp returns dP(up | x)/dx = (1 − 2ε)·φ(x/τ)/τ.
func (s *sign) dpUp(x float64) float64 {
	return (1 - 2*s.misread) * distuv.UnitNormal.Prob(x/s.softness) / s.softness
}

// signProb returns the probability of what a sign observation saw, given
// the value x of its quantity; under the robust alternative of its entry
// (inflate > 1) the observer saw nothing, and it is ½.
func (m *model) signProb(s *sign, x float64) float64 {
	if m.inflate[s.entry] > 1 {
		return 0.5
	}
	p := s.pUp(x)
	if !s.up {
		p = 1 - p
	}
	return p
}
