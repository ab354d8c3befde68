// Package height reduces ride-height logs — suspension potentiometers and
// body-to-ground laser sensors — to steady windows and then to
// methods.Evidence about one axle's lift.
//
// For window i of configuration c the observation model is
//
//	h_i = h0 + L_{c,a}(V_i)/K_a + G·(V_i/100 km/h)² + d·(t_i − t̄) + ε_i
//
// with h0 a static offset per log (flat prior), K_a the axle heave stiffness
// seen at the sensor (log-normal), G the tyre growth at 100 km/h (lasers
// only), d an optional drift and ε_i the window's standard error plus the
// friction band's f²/3. Lift L = q·β, q the dynamic pressure at the airspeed.
package height
