// Package vortex turns observed rotation senses of a trailing vortex behind
// the car into sign evidence about its lift.
//
// A body that makes net lift sheds trailing vortices like a lifting wing's
// tip vortices: air goes up round the outside and down in the middle. Seen
// from behind, looking forward, the right-side vortex then turns
// counter-clockwise and the left-side one clockwise; downforce reverses both
// (lifting-line theory, e.g. Anderson, Fundamentals of Aerodynamics, ch. 5 —
// from memory). The observation is a sign only:
//
//	P(lift sense seen) = ε + (1 − 2ε)·Φ(β(V)/τ)
//
// with ε the misread probability and τ a softness in m², so it constrains
// the posterior only near zero lift. The method applies to fastbacks and to
// notchbacks with a steeply raked rear window (common practice, no source).
package vortex
