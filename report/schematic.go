package report

import (
	"fmt"
	"math"

	"codeberg.org/go-pdf/fpdf"

	"liftfuse/methods/campaign"
)

// The side view is a plain schematic: a generic body outline of the
// campaign's body style scaled to its wheelbase, with the front to the
// left and x measured rearward from the front axle, as the campaign file
// measures it. Lengths in metres.
const (
	wheelR   = 0.31 // wheel radius drawn
	floorZ   = 0.20 // underside height
	overhang = 0.9  // front and rear overhang when nothing lies further out
)

// sideView maps car metres to page millimetres.
type sideView struct {
	x0, ground float64 // page position of x = 0 and of the ground, mm
	s          float64 // mm per metre
}

func (v sideView) at(x, z float64) (float64, float64) { return v.x0 + x*v.s, v.ground - z*v.s }

// outline is the upper edge of a generic body from front to tail, (x, z)
// in metres, for a wheelbase L and the body style; the first and last
// points are the bumpers.
func outline(L, front, tail float64, body string) [][2]float64 {
	roofEnd := 0.72 * L // fastback: the roof falls to the tail from here
	switch body {
	case campaign.BodyHatchback, campaign.BodyWagon:
		roofEnd = L + 0.25
	case campaign.BodyNotchback, campaign.BodyNotchbackRaked:
		roofEnd = 0.85 * L
	}
	pts := [][2]float64{{front, 0.30}, {front, 0.62}, {front + 0.15, 0.72}, {0.35 * L, 0.92}, {0.5 * L, 1.30}, {roofEnd, 1.33}}
	switch body {
	case campaign.BodyNotchback, campaign.BodyNotchbackRaked:
		pts = append(pts, [][2]float64{{L + 0.15, 1.0}, {tail - 0.05, 0.98}}...)
	case campaign.BodyHatchback, campaign.BodyWagon:
		pts = append(pts, [][2]float64{{tail - 0.1, 1.2}, {tail, 0.95}}...)
	default:
		pts = append(pts, [][2]float64{{tail - 0.05, 0.98}}...)
	}
	return append(pts, [2]float64{tail, 0.9}, [2]float64{tail, 0.30})
}

// upperZ is the height of the outline at x (linear between its points).
func upperZ(pts [][2]float64, x float64) float64 {
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		if x >= a[0] && x <= b[0] && b[0] > a[0] {
			return a[1] + (b[1]-a[1])*(x-a[0])/(b[0]-a[0])
		}
	}
	return pts[len(pts)/2][1]
}

// schematic draws the car from the side: wheelbase, axles, pressure taps
// by x and surface, ride-height sensors at their axles, the vortex
// observer's side.
func (r *reporter) schematic() {
	c := r.in.Campaign
	pg := r.pg
	L := c.Vehicle.WheelbaseM
	front, tail := -overhang, L+overhang
	for _, p := range c.Evidence.Pressure {
		for _, t := range p.Taps {
			front, tail = math.Min(front, t.XM-0.15), math.Max(tail, t.XM+0.15)
		}
		for _, u := range p.Uncovered {
			front, tail = math.Min(front, u.XM-0.25), math.Max(tail, u.XM+0.25)
		}
	}
	pg.h2("Where the sensors were", 75)
	s := 0.9 * pg.w / (tail - front)
	height := 1.45*s + 18
	pg.room(height)
	y := pg.pdf.GetY()
	v := sideView{x0: margin + 0.05*pg.w - front*s, ground: y + 1.45*s + 2, s: s}
	pdf := pg.pdf
	pts := outline(L, front, tail, c.Vehicle.Body)
	r.drawBody(v, pts, L)
	r.drawTaps(v, pts)
	r.drawHeights(v, L)
	r.drawVortex(v, pts, tail)
	r.drawScale(v, L, front, tail)
	pdf.SetY(v.ground + 12)
	pg.note(r.schematicNote())
}

// drawBody draws the outline, the floor, the wheels and the ground.
func (r *reporter) drawBody(v sideView, pts [][2]float64, L float64) {
	pdf := r.pg.pdf
	var poly []fpdf.PointType
	for _, p := range pts {
		x, y := v.at(p[0], p[1])
		poly = append(poly, fpdf.PointType{X: x, Y: y})
	}
	last, first := pts[len(pts)-1], pts[0]
	for _, p := range [][2]float64{{last[0] - 0.1, floorZ}, {first[0] + 0.1, floorZ}} {
		x, y := v.at(p[0], p[1])
		poly = append(poly, fpdf.PointType{X: x, Y: y})
	}
	pdf.SetDrawColor(60, 60, 60)
	pdf.SetFillColor(242, 242, 242)
	pdf.SetLineWidth(0.35)
	pdf.Polygon(poly, "DF")
	pdf.SetFillColor(255, 255, 255)
	for _, ax := range []float64{0, L} {
		x, y := v.at(ax, wheelR)
		pdf.Circle(x, y, wheelR*v.s, "DF")
		pdf.Circle(x, y, 0.4*wheelR*v.s, "D")
	}
	gx0, gy := v.at(pts[0][0]-0.2, 0)
	gx1, _ := v.at(pts[len(pts)-1][0]+0.2, 0)
	pdf.SetLineWidth(0.25)
	pdf.Line(gx0, gy, gx1, gy)
}

// drawTaps marks every tap at its x: on the outline for the upper
// surface (filled), under the floor for the lower (hollow), and the
// uncovered patches as grey bars.
func (r *reporter) drawTaps(v sideView, pts [][2]float64) {
	pdf := r.pg.pdf
	pdf.SetLineWidth(0.3)
	pdf.SetDrawColor(0, 0, 0)
	for _, p := range r.in.Campaign.Evidence.Pressure {
		for _, t := range p.Taps {
			z, style := upperZ(pts, t.XM), "F"
			if t.Surface == campaign.SurfaceLower {
				z, style = floorZ, "D"
			}
			x, y := v.at(t.XM, z)
			pdf.SetFillColor(0, 0, 0)
			pdf.SetFillColor(255, 255, 255)
			if style == "F" {
				pdf.SetFillColor(0, 0, 0)
			}
			pdf.Circle(x, y, 0.9, "DF")
			r.pg.font("", 6)
			dy := -1.6
			if t.Surface == campaign.SurfaceLower {
				dy = 3.6
			}
			pdf.Text(x-pdf.GetStringWidth(t.ID)/2, y+dy, t.ID)
		}
		for _, u := range p.Uncovered {
			z := floorZ
			if u.Surface == campaign.SurfaceUpper {
				z = upperZ(pts, u.XM)
			}
			x0, y0 := v.at(u.XM-0.2, z)
			x1, _ := v.at(u.XM+0.2, z)
			pdf.SetDrawColor(150, 150, 150)
			pdf.SetLineWidth(1.2)
			pdf.Line(x0, y0, x1, y0)
			pdf.SetLineWidth(0.3)
			pdf.SetDrawColor(0, 0, 0)
		}
	}
}

// drawHeights draws each ride-height entry at its axle: a spring for a
// potentiometer at its axle, a dashed beam to the ground for a laser at its
// x_m (after defaults, over its axle when the campaign gives none).
func (r *reporter) drawHeights(v sideView, L float64) {
	pdf := r.pg.pdf
	n := map[string]int{}
	for _, e := range r.in.Campaign.Evidence.RideHeight {
		ax := 0.0
		if e.Axle == campaign.AxleRear {
			ax = L
		}
		k := n[e.Axle]
		n[e.Axle]++
		x := ax + 0.16*float64(k) - 0.08
		if e.Sensor == campaign.SensorLaser && e.At.Has("x_m") {
			x = e.XM
		}
		r.pg.font("", 6)
		switch e.Sensor {
		case campaign.SensorLaser:
			xb, yb := v.at(x, floorZ)
			_, yg := v.at(x, 0)
			pdf.SetDrawColor(0, 0, 0)
			pdf.SetFillColor(90, 90, 90)
			pdf.Rect(xb-1, yb-1.6, 2, 1.6, "F")
			pdf.SetLineWidth(0.3)
			pdf.SetDashPattern([]float64{0.8, 0.6}, 0)
			pdf.Line(xb, yb, xb, yg)
			pdf.SetDashPattern(nil, 0)
		default:
			xs, ys := v.at(x, wheelR)
			_, yt := v.at(x, wheelR+0.38)
			spring(pdf, xs, ys, yt)
		}
		xl, yl := v.at(x, wheelR+0.42)
		pdf.Text(xl-pdf.GetStringWidth(e.ID)/2, yl-0.8-2.4*float64(k), e.ID)
	}
}

// spring draws a zigzag from (x, y0) up to (x, y1), mm.
func spring(pdf *fpdf.Fpdf, x, y0, y1 float64) {
	pdf.SetDrawColor(0, 0, 0)
	pdf.SetLineWidth(0.3)
	const turns = 6
	prevX, prevY := x, y0
	for i := 1; i <= turns; i++ {
		yy := y0 + (y1-y0)*float64(i)/turns
		xx := x + 1.1*float64(1-2*(i%2))
		if i == turns {
			xx = x
		}
		pdf.Line(prevX, prevY, xx, yy)
		prevX, prevY = xx, yy
	}
}

// drawVortex marks the vortex observer behind the tail, with its side.
func (r *reporter) drawVortex(v sideView, pts [][2]float64, tail float64) {
	pdf := r.pg.pdf
	for i, e := range r.in.Campaign.Evidence.Vortex {
		x, y := v.at(tail+0.12, 0.75-0.3*float64(i))
		pdf.SetDrawColor(0, 0, 0)
		pdf.SetLineWidth(0.3)
		pdf.Arc(x, y, 1.6, 1.6, 0, 30, 330, "D")
		pdf.Line(x+1.39, y-0.8, x+2.2, y-1.4)
		r.pg.font("", 6)
		pdf.Text(x+2.8, y+0.8, fmt.Sprintf("%s (%s side)", e.ID, e.Side))
	}
	_ = pts
}

// drawScale marks x along the ground every metre from the front axle and
// the wheelbase.
func (r *reporter) drawScale(v sideView, L, front, tail float64) {
	pdf := r.pg.pdf
	r.pg.font("", 6.5)
	pdf.SetDrawColor(120, 120, 120)
	pdf.SetLineWidth(0.2)
	for m := math.Ceil(front); m <= tail; m++ {
		if m == 0 {
			m = 0 // not "−0 m"
		}
		x, y := v.at(m, 0)
		pdf.Line(x, y, x, y+1.2)
		lab := fmt.Sprintf("%g m", m)
		pdf.Text(x-pdf.GetStringWidth(lab)/2, y+3.8, lab)
	}
	x0, y := v.at(0, 0)
	x1, _ := v.at(L, 0)
	y += 7
	pdf.Line(x0, y, x1, y)
	pdf.Line(x0, y-1, x0, y+1)
	pdf.Line(x1, y-1, x1, y+1)
	lab := fmt.Sprintf("wheelbase %.3g m", L)
	pdf.Text((x0+x1)/2-pdf.GetStringWidth(lab)/2, y+3, lab)
}

// schematicNote says what the marks mean, only for what the campaign used.
func (r *reporter) schematicNote() string {
	ev := r.in.Campaign.Evidence
	s := "Side view, front to the left; x is measured rearward from the front axle, as in the campaign file. The outline is a generic " + r.in.Campaign.Vehicle.Body + " body, not the car's."
	if len(ev.Pressure) > 0 {
		s += " Pressure taps: filled on the upper surface, hollow under the floor; grey bars are areas without taps."
	}
	pot, laser := false, false
	for _, e := range ev.RideHeight {
		pot = pot || e.Sensor == campaign.SensorPot
		laser = laser || e.Sensor == campaign.SensorLaser
	}
	if pot {
		s += " Springs: suspension potentiometers at their axle."
	}
	if laser {
		s += " Dashed beams: ride-height lasers, drawn over their axle."
	}
	if len(ev.Vortex) > 0 {
		s += " The circled arrow behind the tail is the vortex observer, with the side it watched."
	}
	return s
}
