// Package reality simulates a test day from physics alone, for tests of the
// whole chain. It shares no code with the adapters or the fusion: it imports
// only the standard library and go.yaml.in/yaml/v3, and computes its
// own air density, dynamic pressure, wheel rates, tyre series rates, load
// transfer and pressure integrals. A test that compares the tool with this
// package therefore compares two independent derivations of the same physics.
//
// # The car
//
// A rigid body on two axles (x rearward from the front axle, wheelbase L).
// Each axle has two wheels; each wheel is a suspension spring of rate k_s
// acting through a motion ratio MR (spring travel per wheel travel), in
// series with a tyre of radial rate k_t:
//
//	k_w = k_s·MR²                        (wheel rate)
//	c_w(F) : F = k_w·(c + p·c²/2) + k_b·max(0, c − g)
//
// where c is the wheel's compression from static (mm), p the progressive
// rate coefficient (1/mm), g the bump-stop gap and k_b its rate. Suspension
// friction is a play operator of half-width f (the body stays put until the
// equilibrium moves more than f away). Tyres are linear: a load change ΔF on
// one wheel changes its radius by ΔF/k_t. Tyre growth adds G·(V/100 km/h)²
// at every point of the body (a laser sees it, a suspension pot does not).
//
// # Loads
//
// The truth is the SAE J1594 axle lift of each configuration, β_f and β_r
// (m²): the change of the axle's contact loads per dynamic pressure, about a
// ground-level mid-wheelbase centre. It contains the pitch of drag. The
// simulator builds it from parts: the vertical pressure resultant split by
// moments (what the taps see), plus the drag D = q·C_D·A at height h_D,
// which moves D·h_D/L from the front contact loads to the rear. A
// longitudinal acceleration a moves m·a·h_cg/L from front to rear (moments
// about a ground point: Milliken & Milliken, Race Car Vehicle Dynamics,
// 1995, ch. 18 — from memory). With the linear speed model
// β(V) = β + γ·(V − 100 km/h)/(100 km/h), V the airspeed.
//
// # Air
//
// ρ = (p − e)/(R_d·T) + e/(R_v·T), an ideal mixture of dry air and water
// vapour, e = RH·e_s(T) with the Magnus form of Alduchov & Eskridge (1996)
// (from memory). Airspeed = ground speed + d·(w + g_run + n(t)): a session
// mean wind w along the road, a gust deviation per run and an AR(1) gust
// noise within the run; q = ½ρV_air².
//
// # Pressure taps
//
// The body surface is a set of flat panels, each with a constant Cp. The
// tapped panels' Cp is a base shape plus a smooth correction solved so that
// the panels' vertical force and its moment give exactly the pressure part
// of the truth, so the integral the taps should reproduce is known exactly.
//
// # Sensors
//
// A pot reads its axle's suspension extension at the wheel; a laser reads
// body-to-ground height at its spot x: the static height there plus
// δ(x) = δ_f·(1 − x/L) + δ_r·x/L (δ_a the body's rise at axle a, tyres
// included) plus tyre growth. Either signal is (mm + AR(1) noise)/gain +
// offset. Ballast points are the same laws at rest with a mass added at x.
// Road inputs, growing with speed, dither the friction band (Car.RoadMm).
//
// # Files
//
// Day.Write(dir, seed) writes campaign.yaml (format 1; with KeysV2 also
// the model-v2 keys: laser x_m, max_speed_kmh, vehicle.cg_height_m,
// air.gust_sd_ms, air.probe_sd_pct, airspeed_kmh), logs/day.csv (t_s,
// v_kmh, dir, optional cfg and airspeed_kmh, one column per sensor named
// by its id), <entry>-readings.csv per tap entry (one reading per steady
// hold at the entry's speeds: the hold's mean of each tap plus noise and a
// reference-port offset) and truth.json (Truth).
//
// # Faults
//
// Faults plants what the campaign does not say: a bump stop met at speed,
// a laser away from its axle, speed creeping through the holds, gusts, the
// speed logged in m/s under a km/h header, a blocked tap, sign-inverted
// taps and a calibration gain stated off. Everything is seeded: the same
// day and seed write the same bytes, and each purpose draws from its own
// stream, so switching a fault on leaves every other draw as it was.
package reality
