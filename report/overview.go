package report

// overview writes the pictures after page 1: lift against speed per axle
// with its credible band per configuration, where the sensors were, and
// the runs used.
func (r *reporter) overview() {
	r.speedCharts()
	r.schematic()
	r.runLog()
}
