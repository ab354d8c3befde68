package checks

import (
	"math"
	"sort"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
)

// Diag hook: set by the external test.
var DiagReduced func(seed int) (*campaign.Campaign, *methods.Reduced)

func TestDiagZ(t *testing.T) {
	if DiagReduced == nil {
		t.Skip()
	}
	var zs []float64
	byLevel := map[int][]float64{}
	var ps []float64
	for seed := 1; seed <= 250; seed++ {
		c, r := DiagReduced(seed)
		for _, d := range methods.Details[*height.Result](r) {
			fits := heightFits(c, d)
			vars := windowVars(d.Windows, d.Entry.FrictionMm)
			_ = vars
			for _, f := range fits {
				for k, i := range f.Kept {
					z := f.Lin.Resid[k] * math.Sqrt(f.Lin.W[k]) / math.Sqrt(1-f.Lin.Lev[k])
					zs = append(zs, z)
					lv := int(math.Round(d.Windows[i].SpeedKmh / 10))
					byLevel[lv] = append(byLevel[lv], z)
				}
				ps = append(ps, f.PCurv)
				if f.PCurv < 0.0 {
					lm := map[int][2]float64{}
					for k, i := range f.All {
						lv := int(math.Round(d.Windows[i].SpeedKmh / 10))
						_ = k
						x := lm[lv]
						x[1]++
						lm[lv] = x
					}
					x0, y, w := design(d.Windows, f.All, d.Entry, false, false, f.QScale)
					lin, _ := wls(x0, y, w)
					x1, _, _ := design(d.Windows, f.All, d.Entry, false, true, f.QScale)
					full, _ := wls(x1, y, w)
					t.Logf("TOP b %.3f full b' %.3f c %.3f d %.3f relsd %.3f", lin.Beta[0], full.Beta[0], full.Beta[len(full.Beta)-1], full.Beta[0]+full.Beta[len(full.Beta)-1]-lin.Beta[0], d.Stiffness.RelSD())
					for k, i := range f.All {
						lv := int(math.Round(d.Windows[i].SpeedKmh / 10))
						x := lm[lv]
						x[0] += lin.Resid[k] * math.Sqrt(w[k]) / x[1]
						lm[lv] = x
					}
					t.Logf("seed %d %s %s pcurv %.3g scale %.2f levels %v beta %v", seed, d.Entry.ID, f.Config, f.PCurv, f.Scale, lm, lin.Beta)
				}
			}
		}
	}
	sort.Float64s(zs)
	sort.Float64s(ps)
	cnt := func(a float64) int { n := 0; for _, p := range ps { if p < a { n++ } }; return n }
	t.Logf("curv tests %d: <0.002 %d, <0.01 %d, <0.05 %d, <0.2 %d", len(ps), cnt(0.002), cnt(0.01), cnt(0.05), cnt(0.2))
	sd := func(a []float64) float64 {
		var s float64
		for _, x := range a {
			s += x * x
		}
		return math.Sqrt(s / float64(len(a)))
	}
	t.Logf("n %d rms %.2f, frac >3: %.4f", len(zs), sd(zs), frac(zs, 3))
	for lv, a := range byLevel {
		t.Logf("level %d: n %d rms %.2f", lv*10, len(a), sd(a))
	}
}

func frac(a []float64, c float64) float64 {
	n := 0
	for _, x := range a {
		if math.Abs(x) > c {
			n++
		}
	}
	return float64(n) / float64(len(a))
}
