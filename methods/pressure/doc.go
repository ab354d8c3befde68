// Package pressure integrates surface pressure taps into front and rear axle
// forces and turns them into methods.Evidence.
//
// A tap k of tributary area A_k whose outward normal has vertical component
// n_k carries the upward force F_k = −p_k·A_k·n_k; the axle split follows
// from moments about the front axle, F_r = Σ F_k·x_k/L, F_f = F − F_r.
// SAE J1594 axle lift also contains the pitch of drag, which the taps do not
// see: drag D = q·C_D·A at height h_D moves D·h_D/L of load from the front
// axle to the rear, so the taps measure
//
//	y_f = s·q·β_f − q·m − (uncovered, front) + ε_f
//	y_r = s·q·β_r + q·m − (uncovered, rear) + ε_r,    m = C_D·A·h_D/L
//
// with s the integration's log-normal scale factor (what a finite set of
// taps misses) and ε the sensor noise plus the reference port's offset.
package pressure
