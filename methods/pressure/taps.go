package pressure

import (
	"fmt"
	"sort"

	"liftfuse/methods/campaign"
)

// Panel is a tap with the area it stands for: A (m²) and the vertical
// component of its outward normal Nz. A·Nz is its plan-view area, signed
// (+ on a roof, − on a floor).
type Panel struct {
	ID      string
	X       float64 // m rearward of the front axle
	Surface string
	A, Nz   float64
}

// Panels returns the taps of an entry as panels. In strips mode the taps are
// centreline stations with a local plan-view width, integrated along x by the
// trapezoid rule separately on each surface,
//
//	∫ f(x) dx ≈ Σ_k f_k·Δ_k,  Δ_k = (x_{k+1} − x_{k−1})/2  (halved at the ends)
//
// which is a sum over tributary lengths; each station becomes a panel of
// area w_k·Δ_k with Nz = +1 on the upper surface and −1 on the lower (a
// given nz replaces that sign, for a strip whose width is measured along a
// sloping surface).
func Panels(e *campaign.PressureEntry) ([]Panel, error) {
	out := make([]Panel, len(e.Taps))
	if e.Mode == campaign.ModePanels {
		for i, t := range e.Taps {
			out[i] = Panel{ID: t.ID, X: t.XM, Surface: t.Surface, A: t.AreaM2, Nz: t.Nz}
		}
		return out, nil
	}
	for _, surface := range []string{campaign.SurfaceUpper, campaign.SurfaceLower} {
		var idx []int
		for i, t := range e.Taps {
			if t.Surface == surface {
				idx = append(idx, i)
			}
		}
		if len(idx) == 0 {
			continue
		}
		if len(idx) == 1 {
			return nil, fmt.Errorf("strips mode needs at least two stations on the %s surface to integrate along x", surface)
		}
		sort.SliceStable(idx, func(a, b int) bool { return e.Taps[idx[a]].XM < e.Taps[idx[b]].XM })
		xs := make([]float64, len(idx))
		for k, i := range idx {
			xs[k] = e.Taps[i].XM
		}
		dx := TrapezoidWeights(xs)
		for k, i := range idx {
			t := e.Taps[i]
			nz := 1.0
			if surface == campaign.SurfaceLower {
				nz = -1
			}
			if t.At.Has("nz") {
				nz = t.Nz
			}
			if dx[k] == 0 {
				return nil, fmt.Errorf("strip station %q shares its x with a neighbour: stations must differ in x", t.ID)
			}
			out[i] = Panel{ID: t.ID, X: t.XM, Surface: surface, A: t.WidthM * dx[k], Nz: nz}
		}
	}
	return out, nil
}

// TrapezoidWeights returns the tributary lengths Δ_k of stations at sorted
// positions xs, so that Σ f_k·Δ_k is the trapezoid rule over [x_1, x_n].
func TrapezoidWeights(xs []float64) []float64 {
	n := len(xs)
	w := make([]float64, n)
	for k := 0; k+1 < n; k++ {
		h := (xs[k+1] - xs[k]) / 2
		w[k] += h
		w[k+1] += h
	}
	return w
}

// Forces is the integrated vertical pressure force of one reading, upward
// positive, in N.
type Forces struct {
	Front, Rear, Total float64
}

// Integrate returns the upward force F = Σ −p_k·A_k·n_k and its split by
// moments about the front axle, F_r = Σ F_k·x_k/L, F_f = F − F_r. p maps tap
// ids to pressures in Pa relative to the reference port.
func Integrate(panels []Panel, p func(id string) float64, wheelbase float64) Forces {
	var f Forces
	for _, pn := range panels {
		fk := -p(pn.ID) * pn.A * pn.Nz
		f.Total += fk
		f.Rear += fk * pn.X / wheelbase
	}
	f.Front = f.Total - f.Rear
	return f
}
