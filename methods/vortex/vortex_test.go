package vortex_test

import (
	"fmt"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/vortex"
)

// TestSenseConvention: a lifting body sheds trailing vortices like a wing's
// tips, up on the outside and down in the middle; seen from behind, the
// right one turns counter-clockwise and the left one clockwise, and
// downforce reverses both (lifting-line theory, e.g. Anderson,
// Fundamentals of Aerodynamics, ch. 5 — from memory).
func TestSenseConvention(t *testing.T) {
	tests := []struct {
		side, sense string
		lift        bool
	}{
		{campaign.SideRight, campaign.SenseCCW, true},
		{campaign.SideLeft, campaign.SenseCW, true},
		{campaign.SideRight, campaign.SenseCW, false},
		{campaign.SideLeft, campaign.SenseCCW, false},
	}
	for _, tt := range tests {
		t.Run(tt.side+" "+tt.sense, func(t *testing.T) {
			if got := vortex.ShowsLift(tt.side, tt.sense); got != tt.lift {
				t.Errorf("ShowsLift(%s, %s) = %v, want %v", tt.side, tt.sense, got, tt.lift)
			}
		})
	}
}

func TestReduce(t *testing.T) {
	c := &campaign.Campaign{Vehicle: campaign.Vehicle{Body: campaign.BodyFastback}, Air: campaign.Air{TemperatureC: 20, PressureHPa: 1013, HumidityPct: 50, CO2ppm: 400}}
	e := &campaign.VortexEntry{ID: "tuft", Side: campaign.SideLeft, Informs: evidence.AxleRear, Misread: 0.05, SoftnessM2: 0.03,
		Observations: []campaign.VortexObs{{Config: "a", SpeedKmh: 60, Sense: campaign.SenseCW}, {Config: "a", SpeedKmh: 120, Sense: campaign.SenseCCW}}}
	r, err := vortex.Reduce(c, e)
	if err != nil {
		t.Fatal(err)
	}
	s := r.Evidence.Signs
	if len(s) != 2 || !s[0].Lift || s[1].Lift {
		t.Fatalf("left cw is lift and left ccw downforce: %+v", s)
	}
	if len(s[0].Terms) != 1 || s[0].Terms[0].Axle != evidence.AxleRear {
		t.Errorf("informs: rear must see only the rear axle: %+v", s[0].Terms)
	}
	c.Vehicle.Body = campaign.BodyWagon
	if _, err := vortex.Reduce(c, e); err == nil {
		t.Error("a wagon without an explicit misread was accepted")
	}
}

func ExampleShowsLift() {
	// Seen from behind, a right-side vortex turning counter-clockwise means
	// net lift; clockwise means downforce.
	fmt.Println(vortex.ShowsLift(campaign.SideRight, campaign.SenseCCW), vortex.ShowsLift(campaign.SideRight, campaign.SenseCW))
	// Output: true false
}
