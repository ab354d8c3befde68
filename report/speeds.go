package report

import (
	"liftfuse/fuse"
	"liftfuse/methods/air"
	"liftfuse/methods/evidence"
)

// Every figure the report gives at a speed is read here, from the result
// document's entries at that speed: β(V) at that V, never β at 100 km/h
// scaled by the speed's q (which is wrong with speed_model: linear).

// axles are the three quantities of a configuration, in table order.
var axles = []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal}

// atSpeed is a configuration's result at a report speed: the axle forces
// in newtons and P(downforce) per axle, front, rear, total.
type atSpeed struct {
	SpeedKmh float64
	N        [3]fuse.Estimate
	PDown    [3]float64
}

// speedOf returns a configuration's figures at the report speed v, and
// false when the result document has no entry at v.
func speedOf(cr fuse.ConfigResult, v float64) (atSpeed, bool) {
	for _, s := range cr.AtSpeeds {
		if s.SpeedKmh == v {
			return atSpeed{SpeedKmh: v, N: [3]fuse.Estimate{s.FrontN, s.RearN, s.TotalN}, PDown: pDownAt(s)}, true
		}
	}
	return atSpeed{}, false
}

// pDownAt is P(downforce) per axle (front, rear, total) at the speed of s,
// from the result document's at_speeds (P(β(V) < 0) at that V).
func pDownAt(s fuse.SpeedResult) [3]float64 {
	return [3]float64{s.PDownforce.Front, s.PDownforce.Rear, s.PDownforce.Total}
}

// changeAt is a configuration's change against the reference at a speed:
// the axle forces' difference in newtons and P(difference < 0) per axle.
type changeAt struct {
	SpeedKmh float64
	N        [3]fuse.Estimate
	PLess    [3]float64
}

// deltaAt returns the change of d's configuration against its reference at
// the speed v, from the fused posterior at that speed: Σ W·β(V) with
// W = q(V) for the configuration and −q(V) for the reference.
//
// For the lead: when the result document's deltas gain at_speeds (as the
// configurations have), read them here instead; with the constant speed
// model this equals the delta's C_L·A times q(V) exactly.
func (r *reporter) deltaAt(d fuse.DeltaResult, v float64) changeAt {
	key := deltaKey{d.Config, d.Versus, v}
	if ch, ok := r.deltas[key]; ok {
		return ch
	}
	if r.deltas == nil {
		r.deltas = map[deltaKey]changeAt{}
	}
	r.deltas[key] = r.computeDeltaAt(d, v)
	return r.deltas[key]
}

// deltaKey names a change at a speed, for the reporter's cache: page 1's
// sentences and its table read the same changes.
type deltaKey struct {
	config, versus string
	speedKmh       float64
}

// computeDeltaAt is deltaAt without the cache.
func (r *reporter) computeDeltaAt(d fuse.DeltaResult, v float64) changeAt {
	q := air.DynamicPressure(r.res.Air.DensityKgM3, air.KmhToMs(v))
	ch := changeAt{SpeedKmh: v}
	for i, ax := range axles {
		ch.N[i], ch.PLess[i] = r.in.Fused.Posterior.At(v, evidence.Term{Config: d.Config, Axle: ax, W: q}, evidence.Term{Config: d.Versus, Axle: ax, W: -q})
	}
	return ch
}
