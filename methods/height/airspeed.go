package height

import (
	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
)

// ProbeName is the scale group of the airspeed probe: the true dynamic
// pressure is q_meas·(1 + k), k ~ N(0, (air.probe_sd_pct/100)²), the
// position error of a probe in the car's own flow field. Everything read
// with the probe shares it. As a log-normal scale group of median 1 it
// equals 1 + k to first order.
const ProbeName = "probe"

// airspeedColumn returns the log's measured-airspeed column (q_pa,
// airspeed_ms or airspeed_kmh, in that order of preference), or "".
func airspeedColumn(l *campaign.LogSpec) string {
	switch {
	case l.QPa != "":
		return l.QPa
	case l.AirspeedMs != "":
		return l.AirspeedMs
	}
	return l.AirspeedKmh
}

// airspeedQ converts a value x of the log's airspeed column to dynamic
// pressure (Pa): q itself for q_pa, ½ρV² for a speed.
func airspeedQ(l *campaign.LogSpec, x, rho float64) float64 {
	switch {
	case l.QPa != "":
		return x
	case l.AirspeedMs != "":
		return air.DynamicPressure(rho, x)
	}
	return air.DynamicPressure(rho, air.KmhToMs(x))
}
