package report

// runLog lists the steady windows used.
func (r *reporter) runLog() {}
