// Package checks runs the model checks of model.md ("Model checks (every
// entry, every run)"): residual and predictive tests on the adapters'
// data-level results (ride-height windows, pressure readings, the campaign)
// that say which entry, configuration, time span or tap looks wrong, a
// likely cause in the trade's words and what to do. Run returns the
// tripped checks as records for the result document's `checks`
// (result-format.md, "Model v2 adds"); Check.String is the warning line.
//
// The checks:
//
//	height-not-linear  ride height against q within a configuration, F tests
//	                   of a q² term and of hinges between driven speeds
//	                   (heightfit.go); the remedy max_speed_kmh is the speed
//	                   below which the rest is linear
//	window-residual    a window beyond 4 sd of the linear fit (height.go)
//	tap-blocked        Cp near 0 between two same-sign neighbours (taps.go)
//	tap-cp-speed       Cp changing with speed against the other taps
//	tap-cp-high        Cp above 1.05
//	speed-units        a log's top speed 3.6 times off the campaign's (units.go)
//	cla-too-large      |C_L·A| beyond 1.5 m² from an entry's own data
//	entry-mirrored     an entry's lift the mirror image of the others'
//	gain-negative      a negative calibration gain not confirmed by the others
//
// Every check is a test with a stated false-alarm rate. The budget is 1 %
// per entry on a clean day (model.md), shared out by Bonferroni's
// inequality, P(any of m tests trips) ≤ Σ α_k (e.g. Casella & Berger,
// Statistical Inference, 2nd ed., §11.2):
//
//	ride-height entry: curvature in q     0.2 % over its configurations
//	                   window beyond 4 sd 0.2 % over its windows
//	                   mirror image       0.2 %, |C_L·A| > 1.5 m² 0.2 %
//	pressure entry:    Cp vs speed        0.3 % over taps × configurations
//	                   Cp > 1.05          0.2 % over taps × readings
//	                   blocked tap        0.1 % over taps × configurations
//	                   mirror image       0.2 %, |C_L·A| > 1.5 m² 0.2 %
//
// Measured on 500 seeded clean simulated days (TestCleanDaysFalseAlarm
// with 500 days; half of them speed_model: linear with sticking pots):
// 7 of 2000 entry-days tripped a check, 0.35 % per entry (window-residual
// 5 of 1500 ride-height entry-days, height-not-linear 2 of 1500, taps 0 of
// 500).
//
// Detection (TestPlantedFaults with 50 days of speed_model: constant):
// bump stop 49/50, a 1 mm window upset 50/50, blocked tap 50/50, leaking
// tap 50/50, Cp 1.3 50/50, inverted taps 46/50, m/s under km/h 50/50,
// negative gain 50/50, with no correct entry named on any of those days.
// With speed_model: linear the lift's speed slope absorbs most of a bump
// stop (4/20) and the leak test is skipped (Cp may change with speed).
//
// Two rules have no noise model and report p_value 0: a negative
// calibration gain (kept only when no other entry agrees with the entry as
// measured) and a log's speed range a factor 3.6 off the campaign's other
// speeds.
package checks
