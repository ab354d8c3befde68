// Package pressure integrates surface pressure taps into front and rear axle
// forces and turns them into methods.Evidence.
//
// A tap k of tributary area A_k whose outward normal has vertical component
// n_k carries the upward force F_k = −p_k·A_k·n_k; the axle split follows
// from moments about the front axle, F_r = Σ F_k·x_k/L, F_f = F − F_r.
// SAE J1594 axle lift also contains the pitch of drag, which the taps do not
// see: drag D = q·C_D·A at height h_D moves D·h_D/L of load from the front
// axle to the rear. The integration scale s says how far the taps'
// integral F_a is from the covered force they stand for, s·F_a; the
// uncovered patches and the drag pitch are added outside it:
//
//	β_f·q = s·F_f + U_f + q·m,    β_r·q = s·F_r + U_r − q·m,    m = C_D·A·h_D/L
//
// with m log-normal about the stated C_D·A·h_D/L (median as stated, log-sd
// vehicle.drag sd_pct/100; see DragPitch), as a C_D·A is known to within a
// factor. So with s = 1 + σ the taps measure (see builder for the linearisation)
//
//	y_a = F_a = β_a·q − U_a ∓ q·m − σ·b̂_a·q + ε_a
//
// with ε the sensor noise plus the reference port's offset, the session
// wind's error when the direction is unknown (common to the reading's two
// rows), and the run-to-run wind (common to the readings of one pass).
//
// Taps logged in time (FromLogs) become readings first: each steady window
// of a log gives one reading with each tap's mean and its AR(1)-aware
// standard error, standstill windows pin each tap's zero, and sensor_sd_pa
// is estimated from the windows' standard errors.
package pressure
