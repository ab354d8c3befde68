package checks

import (
	"math"
	"sort"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
)

// cfgFit is the linear model of one ride-height entry's windows in one
// configuration, directions pooled:
//
//	h_i − κ_i·h̄_cg = o_log + b·q_i [+ b₁·q_i·(V_i/100 − 1)] [+ c·dir_i·V_i] [+ d_log·t_i] + ε_i,
//	var ε_i = SE_i² + friction²/3 (+ the load transfer's share and the
//	          run-to-run wind's, see newEntryData),
//
// with a static offset per log, the deflection linear in the ground dynamic
// pressure q (lift, and a laser's tyre growth, which is ∝ V² ∝ q too), the
// linear-in-speed lift of speed_model: linear, the along-road wind (the air
// q is ½ρ(V ± w)², whose cross term 2ρVw flips with direction) and a drift
// per log when the entry declares one.
type cfgFit struct {
	Config string
	All    []int   // windows of the configuration (indices into Result.Windows)
	Kept   []int   // those below the cut speed (all when linear)
	PCurv  float64 // p-value of the curvature test on All
	CutKmh float64 // windows above this speed leave the linear range; 0: none
	Broken bool    // not linear even at the lowest speeds
	Lin    *wlsFit // linear fit on Kept
	QScale float64 // q is entered as q/QScale
	Scale  float64 // residual scale s ≥ 1 of Lin (robust)
}

// speedLevelGapKmh separates two driven speeds (common practice, no source).
const speedLevelGapKmh = 5

// design builds the model's rows for windows idx; extra, when not nil,
// adds a column of the normalised q/QScale (a curvature or hinge term).
// The q column is always column 0.
func design(d *entryData, idx []int, linearSpeed bool, extra func(qn float64) float64, qs float64) ([][]float64, []float64, []float64) {
	ws, e := d.ws, d.e
	logCol := map[int]int{}
	var logs []int
	dirs := map[int]bool{}
	for _, i := range idx {
		if _, ok := logCol[ws[i].Log]; !ok {
			logCol[ws[i].Log] = len(logs)
			logs = append(logs, ws[i].Log)
		}
		if ws[i].Q > 0 {
			dirs[ws[i].Direction] = true
		}
	}
	wind := dirs[1] && dirs[-1]
	tbar := make([]float64, len(logs))
	cnt := make([]float64, len(logs))
	for _, i := range idx {
		k := logCol[ws[i].Log]
		tbar[k] += (ws[i].From + ws[i].To) / 2
		cnt[k]++
	}
	for k := range tbar {
		tbar[k] /= cnt[k]
	}
	var x [][]float64
	var y, w []float64
	for _, i := range idx {
		win := ws[i]
		qn := win.Q / qs
		row := []float64{qn}
		if linearSpeed {
			row = append(row, qn*(win.SpeedKmh/evidence.RefSpeedKmh-1))
		}
		if wind {
			row = append(row, float64(win.Direction)*win.SpeedKmh/evidence.RefSpeedKmh)
		}
		for k := range logs {
			v := 0.0
			if logCol[win.Log] == k {
				v = 1
			}
			row = append(row, v)
		}
		if e.Drift {
			for k := range logs {
				v := 0.0
				if logCol[win.Log] == k {
					v = ((win.From+win.To)/2 - tbar[k]) / 1000
				}
				row = append(row, v)
			}
		}
		if extra != nil {
			row = append(row, extra(qn))
		}
		x = append(x, row)
		y = append(y, d.y[i])
		w = append(w, 1/d.v[i])
	}
	return x, y, w
}

// curvature tests the linear model of windows idx against two kinds of
// departure: a q² term (progressive springs, a smooth stiffening), and a
// hinge max(0, q − q_k) at each knot q_k halfway (in q) between two driven
// speeds with at least three speeds below it and one above (a bump stop
// or end stop met between them). Each is an extra-sum-of-squares test
// (extraTest: F on the residuals' scale and χ² on the windows' stated
// variances, the larger p-value); the p-value is the smallest times the
// number of tests (Bonferroni). It returns that p-value and the linear fit
// (nil when the data cannot tell).
func curvature(d *entryData, idx []int, linearSpeed bool, qs float64) (float64, *wlsFit) {
	ws := d.ws
	x0, y, w := design(d, idx, linearSpeed, nil, qs)
	lin, err := wls(x0, y, w)
	if err != nil {
		return 1, nil
	}
	lv := levels(ws, idx)
	if len(lv) < 3 {
		return 1, lin
	}
	extras := []func(float64) float64{func(qn float64) float64 { return qn * qn }}
	for k := 3; k < len(lv); k++ {
		lo, hi := math.Inf(-1), math.Inf(1)
		for _, i := range idx {
			switch v := ws[i].SpeedKmh; {
			case v <= lv[k-1][1]:
				lo = math.Max(lo, ws[i].Q)
			case v >= lv[k][0]:
				hi = math.Min(hi, ws[i].Q)
			}
		}
		knot := (lo + hi) / 2 / qs
		extras = append(extras, func(qn float64) float64 { return math.Max(0, qn-knot) })
	}
	best := 1.0
	for _, ex := range extras {
		x1, _, _ := design(d, idx, linearSpeed, ex, qs)
		full, err := wls(x1, y, w)
		if err != nil || full.DF < 2 {
			continue
		}
		best = math.Min(best, extraTest(lin, full))
	}
	return math.Min(1, best*float64(len(extras))), lin
}

// levels groups the windows' speeds into driven speeds (gaps of at least
// speedLevelGapKmh) and returns each level's lowest and highest speed,
// slowest first.
func levels(ws []height.Window, idx []int) [][2]float64 {
	v := make([]float64, len(idx))
	for k, i := range idx {
		v[k] = ws[i].SpeedKmh
	}
	sort.Float64s(v)
	var out [][2]float64
	for k, s := range v {
		if k == 0 || s-v[k-1] >= speedLevelGapKmh {
			out = append(out, [2]float64{s, s})
		}
		out[len(out)-1][1] = s
	}
	return out
}

// heightFits fits every configuration of a ride-height entry. When the
// curvature test trips, the fastest driven speed is dropped until what is
// left is linear (at a lenient 5 %); the cut lies halfway between the last
// speed kept and the first dropped, rounded to 5 km/h.
func heightFits(c *campaign.Campaign, r *height.Result, d *entryData) []cfgFit {
	linearSpeed := c.Prior.SpeedModel == campaign.SpeedLinear
	order, byCfg := configWindows(r)
	alpha := alphaNotLinear / float64(len(order))
	var out []cfgFit
	for _, cfg := range order {
		idx := byCfg[cfg]
		qs := qScale(r, idx)
		if qs == 0 {
			continue
		}
		f := cfgFit{Config: cfg, All: idx, Kept: idx, QScale: qs}
		f.PCurv, f.Lin = curvature(d, idx, linearSpeed, qs)
		if f.PCurv < alpha && f.Lin != nil {
			f.PCurv = oneWindow(d, idx, linearSpeed, qs, f.Lin, f.PCurv)
		}
		if f.PCurv < alpha {
			f.cut(d, linearSpeed)
		}
		if f.Lin == nil {
			continue
		}
		f.Scale = robustScale(f.Lin)
		out = append(out, f)
	}
	return out
}

// configWindows returns the configurations of an entry's windows in order
// of first appearance, and the indices of each one's windows.
func configWindows(r *height.Result) (order []string, byCfg map[string][]int) {
	byCfg = map[string][]int{}
	for i, w := range r.Windows {
		if _, ok := byCfg[w.Config]; !ok {
			order = append(order, w.Config)
		}
		byCfg[w.Config] = append(byCfg[w.Config], i)
	}
	return order, byCfg
}

// qScale is the largest q of the windows idx (Pa), the scale of their fit.
func qScale(r *height.Result, idx []int) float64 {
	qs := 0.0
	for _, i := range idx {
		qs = math.Max(qs, r.Windows[i].Q)
	}
	return qs
}

// oneWindow repeats the curvature test without the window farthest off the
// line (largest studentised residual) and returns the larger p-value: a
// departure that one window carries is a gust or a bump in that window
// (the residual check's business), not a bend of the axle, which every
// window at the speeds beyond it shares (a deletion diagnostic; Cook &
// Weisberg, Residuals and Influence in Regression, 1982, §3.4).
func oneWindow(d *entryData, idx []int, linearSpeed bool, qs float64, lin *wlsFit, p float64) float64 {
	k, _ := worst(lin, 1)
	if k < 0 {
		return p
	}
	rest := append(append([]int(nil), idx[:k]...), idx[k+1:]...)
	if q, fit := curvature(d, rest, linearSpeed, qs); fit != nil {
		return math.Max(p, q)
	}
	return p
}

// cut drops the fastest driven speeds until the rest is linear.
func (f *cfgFit) cut(d *entryData, linearSpeed bool) {
	ws := d.ws
	lv := levels(ws, f.All)
	for n := len(lv) - 1; n >= 3; n-- {
		top := lv[n-1][1]
		var keep []int
		for _, i := range f.All {
			if ws[i].SpeedKmh <= top {
				keep = append(keep, i)
			}
		}
		p, lin := curvature(d, keep, linearSpeed, f.QScale)
		if lin != nil && p >= 0.05 {
			f.Kept, f.Lin = keep, lin
			f.CutKmh = 5 * math.Round((top+lv[n][0])/2/5)
			return
		}
	}
	f.Broken = true
}

// robustScale is s = max(1, 1.4826·median|r_i|·√w_i): how much wider the
// residuals are than the windows' standard errors say, by the median
// absolute deviation (Huber & Ronchetti, Robust Statistics, 2nd ed., §5.1),
// never below 1 so that well-measured windows are taken at their word.
func robustScale(f *wlsFit) float64 {
	a := make([]float64, len(f.Resid))
	for i, r := range f.Resid {
		a[i] = math.Abs(r) * math.Sqrt(f.W[i])
	}
	return math.Max(1, 1.4826*median(a))
}

func median(a []float64) float64 {
	if len(a) == 0 {
		return 0
	}
	b := append([]float64(nil), a...)
	sort.Float64s(b)
	n := len(b)
	if n%2 == 1 {
		return b[n/2]
	}
	return (b[n/2-1] + b[n/2]) / 2
}

// levelPools returns, for each window, the median of vn over the windows
// at its driven speed (the speed levels of levels: sorted speeds split where
// they step by speedLevelGapKmh or more), or 0 where fewer than three
// windows share it. One sort, so the cost is n·log n in the windows.
func levelPools(ws []height.Window, vn []float64) []float64 {
	order := make([]int, len(ws))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return ws[order[a]].SpeedKmh < ws[order[b]].SpeedKmh })
	out := make([]float64, len(ws))
	in := make([]float64, 0, len(ws))
	for lo := 0; lo < len(order); {
		hi := lo + 1
		for hi < len(order) && ws[order[hi]].SpeedKmh-ws[order[hi-1]].SpeedKmh < speedLevelGapKmh {
			hi++
		}
		if hi-lo >= 3 {
			in = in[:0]
			for _, i := range order[lo:hi] {
				in = append(in, vn[i])
			}
			m := median(in)
			for _, i := range order[lo:hi] {
				out[i] = m
			}
		}
		lo = hi
	}
	return out
}

// windowVars returns each window's variance σ_i² = v_i/N_i + friction²/3,
// where v_i is the pooled variance-times-samples SE²·N (for a stationary
// noise SE² ∝ 1/N): the larger of the median over the entry's windows and
// the median over the windows at the same driven speed (when there are at
// least three; road noise grows with speed). A window's own SE is not taken
// at its word: estimated from a few effective samples it comes out low by
// chance, and a gust or a bump inside a window inflates it, which would
// hide the very upset the residual check looks for. Each SE²·N is roughly
// a scaled χ²_ν/ν with ν = n_eff − 1, whose median lies below its mean by
// the factor (1 − 2/(9ν))³ (Wilson & Hilferty 1931, PNAS 17:684–688); the
// medians are divided by it.
func windowVars(ws []height.Window, frictionMm float64) []float64 {
	vn := make([]float64, len(ws))
	ne := make([]float64, len(ws))
	for i, w := range ws {
		vn[i] = w.SE * w.SE * float64(w.N)
		ne[i] = w.NEff
	}
	nu := math.Max(2, median(ne)-1)
	unbias := math.Pow(1-2/(9*nu), 3)
	pool := median(vn) / unbias
	level := levelPools(ws, vn)
	for i := range level {
		level[i] /= unbias
	}
	out := make([]float64, len(ws))
	for i, w := range ws {
		out[i] = math.Max(pool, level[i])/float64(max(1, w.N)) + frictionMm*frictionMm/3 + 1e-8
	}
	return out
}
