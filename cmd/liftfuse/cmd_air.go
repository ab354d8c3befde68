package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"

	"github.com/spf13/cobra"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
)

type airOptions struct {
	temperatureC, pressureHPa, humidityPct, co2ppm, speedKmh float64
	json                                                     bool
}

// airResult is the JSON of `liftfuse air --json`.
type airResult struct {
	DensityKgM3       float64  `json:"density_kg_m3"`
	Method            string   `json:"method"`
	SpeedKmh          *float64 `json:"speed_kmh,omitempty"`
	DynamicPressurePa *float64 `json:"dynamic_pressure_pa,omitempty"`
}

func newAirCmd(runF func(*airOptions) error) *cobra.Command {
	var o airOptions
	cmd := &cobra.Command{
		Use:   "air",
		Short: "Air density (CIPM-2007) and dynamic pressure from weather readings",
		Long: `air computes the density of moist air with the CIPM-2007 equation (Picard et
al., Metrologia 45 (2008) 149) and, with --speed-kmh, the dynamic pressure
q = ½ρV² at that airspeed.`,
		Example: "  liftfuse air --temperature-c 19.5 --pressure-hpa 1011 --humidity-pct 62 --speed-kmh 120",
		Args:    argsExactly(0, "no arguments"),
		RunE: func(cmd *cobra.Command, _ []string) error {
			if err := requireFlags(cmd, "temperature-c", "pressure-hpa", "humidity-pct"); err != nil {
				return err
			}
			if !cmd.Flags().Changed("speed-kmh") {
				o.speedKmh = math.NaN()
			}
			if runF != nil {
				return runF(&o)
			}
			return runAir(o, cmd.OutOrStdout())
		},
	}
	f := cmd.Flags()
	f.Float64Var(&o.temperatureC, "temperature-c", 0, "air temperature, °C (required)")
	f.Float64Var(&o.pressureHPa, "pressure-hpa", 0, "barometric pressure (station, not sea-level), hPa (required)")
	f.Float64Var(&o.humidityPct, "humidity-pct", 0, "relative humidity, % (required)")
	f.Float64Var(&o.co2ppm, "co2-ppm", campaign.DefaultCO2ppm, "CO₂ mole fraction, ppm")
	f.Float64Var(&o.speedKmh, "speed-kmh", 0, "airspeed for the dynamic pressure, km/h")
	f.BoolVar(&o.json, "json", false, "print the result as JSON on stdout")
	return cmd
}

func runAir(o airOptions, out io.Writer) error {
	switch {
	case !(o.temperatureC >= -40 && o.temperatureC <= 60):
		return badInput("--temperature-c must lie in [-40, 60] °C, got %g", o.temperatureC)
	case !(o.pressureHPa >= 500 && o.pressureHPa <= 1100):
		return badInput("--pressure-hpa must lie in [500, 1100] hPa, got %g", o.pressureHPa)
	case !(o.humidityPct >= 0 && o.humidityPct <= 100):
		return badInput("--humidity-pct must lie in [0, 100] %%, got %g", o.humidityPct)
	case !(o.co2ppm >= 0 && o.co2ppm <= 10000):
		return badInput("--co2-ppm must lie in [0, 10000] ppm, got %g", o.co2ppm)
	case !math.IsNaN(o.speedKmh) && !(o.speedKmh >= 0 && o.speedKmh < 1000):
		return badInput("--speed-kmh must lie in [0, 1000) km/h, got %g", o.speedKmh)
	}
	rho := air.Density(o.temperatureC, o.pressureHPa*100, o.humidityPct/100, o.co2ppm*1e-6)
	res := airResult{DensityKgM3: rho, Method: "CIPM-2007"}
	if !math.IsNaN(o.speedKmh) {
		v, q := o.speedKmh, air.DynamicPressure(rho, air.KmhToMs(o.speedKmh))
		res.SpeedKmh, res.DynamicPressurePa = &v, &q
	}
	if o.json {
		enc := json.NewEncoder(out)
		enc.SetIndent("", "  ")
		return enc.Encode(res)
	}
	fmt.Fprintf(out, "air density  %.5f kg/m³  (CIPM-2007, %g °C, %g hPa, %g %% RH, %g ppm CO₂)\n",
		rho, o.temperatureC, o.pressureHPa, o.humidityPct, o.co2ppm)
	if res.DynamicPressurePa != nil {
		fmt.Fprintf(out, "dynamic pressure  %.1f Pa at %g km/h\n", *res.DynamicPressurePa, o.speedKmh)
	}
	return nil
}
