// Package checks runs the model checks of model.md ("Model checks (every
// entry, every run)"): residual and predictive tests on the adapters'
// data-level results (ride-height windows, pressure readings, the campaign)
// that say which entry, configuration, time span or tap looks wrong, a
// likely cause in the trade's words and what to do.
//
// Every check is a test with a stated false-alarm rate. The budget is 1 %
// per entry on a clean day (model.md), shared out by Bonferroni's
// inequality, P(any of m tests trips) ≤ Σ α_k (Casella & Berger, Statistical
// Inference, 2nd ed., §11.2.3 / Bonferroni):
//
//	ride-height entry: curvature in q        0.2 % over its configurations
//	                   (the F test runs ~1.5× its nominal rate on the
//	                   simulator: measured 6 of 1500 below 0.002)
//	                   window beyond 4 sd    Bonferroni p < 0.2 % over its windows
//	                   mirror image, |C_L·A| 0.2 % each
//	pressure entry:    Cp changing with speed 0.4 % over taps × configurations
//	                   Cp > 1.05             0.2 % over taps × readings
//	                   blocked tap           rule plus a 0.1 % test
//	                   mirror image, |C_L·A| 0.2 % each
//
// Rules with no noise model (a negative calibration gain, a log's speed
// range a factor 3.6 off the campaign's) report p_value 0: they are not
// tests, and they trip only when the data also point the same way where the
// campaign lets us see it.
//
// The rates are measured on ≥ 50 seeded clean simulated days in the tests
// (TestCleanDaysFalseAlarm).
package checks
