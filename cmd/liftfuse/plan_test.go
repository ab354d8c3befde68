package main

import (
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/campaign"
)

// TestPlanTarget: the flags over the campaign's target (its default is
// the campaign package's rule, tested there: TestLoadDefaultTarget).
func TestPlanTarget(t *testing.T) {
	two := func(target campaign.Target, ref string) *campaign.Campaign {
		c := &campaign.Campaign{Configurations: []campaign.Configuration{{ID: "stock"}, {ID: "wing"}}}
		c.Plan.Target, c.Report.ReferenceConfig = target, ref
		return c
	}
	tests := []struct {
		name  string
		c     *campaign.Campaign
		o     planOptions
		want  fuse.Target
		inErr string
	}{
		{"the campaign's target", two(campaign.Target{Config: "stock", Axle: "front"}, "stock"), planOptions{}, fuse.Target{Config: "stock", Axle: "front"}, ""},
		{"last versus the reference", two(campaign.Target{Config: "wing", Axle: "rear", Versus: "stock"}, "stock"), planOptions{}, fuse.Target{Config: "wing", Axle: "rear", Versus: "stock"}, ""},
		{"the last is the reference", two(campaign.Target{Config: "wing", Axle: "rear"}, "wing"), planOptions{}, fuse.Target{Config: "wing", Axle: "rear"}, ""},
		{"--target-config drops the difference", two(campaign.Target{Config: "wing", Axle: "rear", Versus: "stock"}, "stock"), planOptions{config: "stock"}, fuse.Target{Config: "stock", Axle: "rear"}, ""},
		{"--target-axle over the default", two(campaign.Target{Config: "wing", Axle: "rear", Versus: "stock"}, "stock"), planOptions{axle: "total"}, fuse.Target{Config: "wing", Axle: "total", Versus: "stock"}, ""},
		{"unknown configuration lists the known", two(campaign.Target{Config: "wing", Axle: "rear", Versus: "stock"}, "stock"), planOptions{config: "slick"}, fuse.Target{}, `unknown target configuration "slick" (known: stock and wing)`},
		{"unknown --versus", two(campaign.Target{Config: "wing", Axle: "rear", Versus: "stock"}, "stock"), planOptions{versus: "slick"}, fuse.Target{}, `unknown configuration "slick" for --versus`},
		{"a difference to itself", two(campaign.Target{Config: "wing", Axle: "rear", Versus: "stock"}, "stock"), planOptions{versus: "wing"}, fuse.Target{}, "two different configurations"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, err := planTarget(tt.o, tt.c)
			if tt.inErr != "" {
				if err == nil || !strings.Contains(err.Error(), tt.inErr) || exitCode(err) != exitInput {
					t.Errorf("error %v, want bad input with %q", err, tt.inErr)
				}
				return
			}
			if err != nil || got != tt.want {
				t.Errorf("target %+v (%v), want %+v", got, err, tt.want)
			}
		})
	}
}
