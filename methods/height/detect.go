package height

import (
	"fmt"
	"math"
	"sort"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
)

// Detectability says what a height entry can resolve.
type Detectability struct {
	SigmaMM     float64 // typical window sd at speed incl. friction, mm
	ResolvableN float64 // smallest axle load resolvable at 2 sd, N
	// ResolvableCLA100 is ResolvableN as C_L·A at 100 km/h, m².
	ResolvableCLA100 float64
	K                float64 // N/mm
	Rho              float64
}

// Detect computes detectability from the windows at speed: a deflection is
// resolvable at two standard deviations of one window, so the smallest
// load is L = 2·σ·K whatever the speed, and the C_L·A it takes to make that
// load is L/q(V). A stiffer car needs more speed for the same C_L·A (common
// practice, no source).
func Detect(ws []Window, frictionMM, K, rho float64) Detectability {
	var maxV float64
	for _, w := range ws {
		maxV = math.Max(maxV, w.SpeedKmh)
	}
	var ses []float64
	for _, w := range ws {
		if w.SpeedKmh >= 0.5*maxV {
			ses = append(ses, w.SE)
		}
	}
	sort.Float64s(ses)
	se := ses[len(ses)/2]
	sigma := math.Sqrt(se*se + frictionMM*frictionMM/3)
	L := 2 * sigma * K
	return Detectability{SigmaMM: sigma, ResolvableN: L, K: K, Rho: rho,
		ResolvableCLA100: L / air.DynamicPressure(rho, air.KmhToMs(100))}
}

// SpeedFor returns the speed (km/h) at which an axle C_L·A of size |cla| m²
// makes a resolvable load: ½ρV²|β| = L.
func (d Detectability) SpeedFor(cla float64) float64 {
	return air.MsToKmh(math.Sqrt(2 * d.ResolvableN / (d.Rho * math.Abs(cla))))
}

func warnings(e *campaign.RideHeightEntry, res *Result, rho float64) []string {
	var out []string
	if res.Stiffness.Warning != "" {
		out = append(out, res.Stiffness.Warning)
	}
	if res.Dropped > 0 {
		out = append(out, fmt.Sprintf("%s: %d steady windows above max_speed_kmh = %g km/h were not used", e.ID, res.Dropped, e.MaxSpeedKmh))
	}
	var scatter []float64
	var maxV, maxQ float64
	for _, w := range res.Windows {
		scatter = append(scatter, w.Scatter)
		maxV, maxQ = math.Max(maxV, w.SpeedKmh), math.Max(maxQ, w.Q)
	}
	sort.Float64s(scatter)
	if s := scatter[len(scatter)/2]; s >= 3 {
		out = append(out, fmt.Sprintf("%s: within-window scatter is ±%.1f mm; a sensor this noisy (cheap ultrasonic sensors scatter ±3–4 mm) cannot resolve the 0.5–2 mm changes that matter", e.ID, s))
	}
	for li := range e.Logs {
		low := 0
		for _, w := range res.Windows {
			if w.Log == li && w.SpeedKmh < 0.4*maxV {
				low++
			}
		}
		if low < 2 {
			out = append(out, fmt.Sprintf("%s: log %s has %d low-speed windows: the static offset is poorly pinned; add slow or standing stretches", e.ID, e.Logs[li].File, low))
		}
	}
	if e.Sensor == campaign.SensorLaser {
		bands := map[int]map[string]bool{}
		configs := map[string]bool{}
		for _, w := range res.Windows {
			if w.SpeedKmh < 0.4*maxV {
				continue
			}
			b := int(math.Round(w.SpeedKmh / 10))
			if bands[b] == nil {
				bands[b] = map[string]bool{}
			}
			bands[b][w.Config] = true
			configs[w.Config] = true
		}
		paired := false
		for _, cs := range bands {
			paired = paired || len(cs) >= 2
		}
		if len(configs) >= 2 && !paired {
			out = append(out, fmt.Sprintf("%s: no speed was driven in two configurations: a laser cannot tell lift from tyre growth without A/B runs at matched speeds", e.ID))
		}
	}
	if defl := maxQ * typicalCLA / res.Stiffness.K; defl < res.Detect.SigmaMM {
		out = append(out, fmt.Sprintf("%s: at the top speed (%.0f km/h) a C_L·A of %.1f m² deflects this axle only %.2f mm, under the window scatter of %.2f mm: drive faster or use a softer set-up",
			e.ID, maxV, typicalCLA, defl, res.Detect.SigmaMM))
	}
	return out
}
