package reality_test

import (
	"fmt"
	"os"

	"liftfuse/methods/sim/reality"
)

// A variant of the default day: today's keys only, a linear speed model on
// the spoiler, the speed creeping through the holds, two front pots of
// which one is stated 12 % off.
func ExampleDay_Write() {
	d := reality.Default()
	d.Keys = reality.KeysV1
	d.Configs[1].RearSlope = -0.03 // m² per 100 km/h above 100 km/h
	d.Faults.CreepKmhPerS = 0.75
	second := d.Sensors[0]
	second.ID = "front-pot-2"
	d.Sensors = append(d.Sensors, second)
	d.Faults.GainError = &reality.GainError{Sensor: "front-pot-2", Pct: 12}

	dir, err := os.MkdirTemp("", "reality-day")
	if err != nil {
		panic(err)
	}
	defer os.RemoveAll(dir)
	truth, err := d.Write(dir, 42)
	if err != nil {
		panic(err)
	}
	for _, c := range truth.Configs {
		at := c.AtSpeeds[len(c.AtSpeeds)-1]
		fmt.Printf("%-8s front %+.3f rear %+.3f m²; at %g km/h rear %+.4f m², %+.1f N\n",
			c.ID, c.Front, c.Rear, at.SpeedKmh, at.Rear, at.RearN)
	}
	for _, f := range truth.Faults {
		fmt.Println(f)
	}
	// By hand: ρ(14 °C, 1009 hPa, 70 %) = 1.2190 kg/m³, q(160 km/h) = 1204 Pa;
	// β_r(160) = −0.06 − 0.03·0.6 = −0.078 m².

	// Output:
	// baseline front +0.100 rear +0.080 m²; at 160 km/h rear +0.0800 m², +96.3 N
	// spoiler  front +0.115 rear -0.060 m²; at 160 km/h rear -0.0780 m², -93.9 N
	// speed creeps 0.75 km/h/s through the holds
	// calibration of front-pot-2 stated +12 %
}
