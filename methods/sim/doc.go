// Package sim writes a synthetic test campaign — the campaign file, its
// ride-height log, its pressure readings and the truth it was made from —
// from a stated truth and a test plan. It is for planning a test day before
// driving it, for the test suite, and for the bundled demo.
//
// The physics is that of the adapters (model.md): ride height follows axle
// lift through the heave stiffness (and, for a laser, tyre growth), taps
// carry the pressure field whose integral is the axle lift less the pitch
// of drag, and a trailing vortex turns with the sign of the lift. The true
// values of what the campaign only knows with uncertainty (spring rates,
// calibration gains, tyre growth, wind, drag) are stated in the spec and
// may differ from what the campaign declares, to plant an error.
package sim
