// Package height reduces ride-height logs — suspension potentiometers and
// body-to-ground laser sensors — to steady windows and then to
// methods.Evidence about the axles' lift.
//
// For window i of configuration c in log l the observation model is
//
//	h_i = h0_l + s·Σ_a (W_a/K_a)·L_{c,a}(V_i) + Σ_a W_a·G_a·(V_i/100 km/h)²
//	      + κ_i·h_cg + d_l·(t_i − t̄_l) + c_i·g_r + ε_i
//
// with h0 a static offset per log (flat prior); W_a the sensor's lever on
// axle a (a pot: 1 on its own axle; a laser at x behind the front axle:
// 1 − x/L on the front, x/L on the rear, see Lever) and K_a the axle's
// heave stiffness seen there (springs and motion ratio, tyres in series
// for a laser, or a ballast fit), s its log-normal scale factors
// (stiffness, calibration gain, airspeed probe); G_a the axle's tyre growth
// at 100 km/h (lasers only); κ_i·h_cg the load m·a_i·h_cg/L that the
// window's mean acceleration a_i moves from the front axle to the rear
// (nuisance "cg-height", prior vehicle.cg_height_m ± cg_height_sd_m); d an
// optional drift; g_r the wind deviation of the window's run (one pass in
// one direction; nuisance "gust/<file>@<start>", shared by every sensor of
// the log, its sd estimated from the data, package gust) with c_i its
// linearised effect; and ε_i the window's standard error plus the friction
// band's f²/3. Lift L = q·β, q the dynamic pressure at the airspeed: at
// ground speed with the session's wind, or measured by a probe.
//
// Windows above an entry's max_speed_kmh are dropped with a warning.
//
// A laser away from its axle informs the lever's combination of both axles;
// evidence.Quantity names one axle, so its standalone result and agreement
// are reported on its own axle (the combination's other axle is then only
// as sharp as the other entries make it).
package height
