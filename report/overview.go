package report

// overview writes the pictures after page 1: lift against speed per axle
// with its credible band per configuration, where the sensors were, and
// (the runs used are listed near the end, in runLog).
func (r *reporter) overview() {
	r.speedCharts()
	r.schematic()
}
