package report

import (
	"io"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// methodReport is what the report lays out for one measurement method.
// Each method's is in a file of its own (height.go, pressure.go,
// vortex.go) with its sections and charts.
type methodReport struct {
	kind evidence.Kind
	// sections writes the method's part of "What each method says": a
	// sub-section per entry, with its table and charts.
	sections func(r *reporter)
	// reduced writes, as terminal tables, what the method's adapter made of
	// each entry's raw data (liftfuse reduce), forces in the unit u.
	reduced func(w io.Writer, red *methods.Reduced, u forceUnit)
	// signOnly: an entry alone says only lift or downforce, so the
	// agreement chart leaves it out.
	signOnly bool
	// limits are the method's bullets under "What each method cannot see",
	// for what the campaign used of it (nothing when it used none).
	limits func(c *campaign.Campaign) []string
}

// methodReports lists the measurement methods in report order. A new
// method is a file with its methodReport, and one line here.
func methodReports() []methodReport {
	return []methodReport{
		heightReport(),
		pressureReport(),
		vortexReport(),
	}
}

// reportOf returns the methodReport of a method kind (as the result
// document spells it), and false for a kind the report does not know.
func reportOf(kind string) (methodReport, bool) {
	for _, m := range methodReports() {
		if string(m.kind) == kind {
			return m, true
		}
	}
	return methodReport{}, false
}

// methods writes "What each method says": every method's sections in turn.
func (r *reporter) methods() {
	r.pg.h1("What each method says")
	r.pg.para("Each entry below is reduced from its raw data and then fused on its own, with the same priors as the full campaign: its own verdict, before it is weighed against the others. Intervals are " + r.level() + " central credible intervals; " + symCLA + " is per axle, lift positive (SAE J1594).")
	for _, m := range methodReports() {
		m.sections(r)
	}
}

// standaloneRows lists what one entry says on its own.
func (r *reporter) standaloneRows(id string) [][]string {
	var rows [][]string
	for _, m := range r.res.Methods {
		if m.ID != id {
			continue
		}
		for _, s := range m.Standalone {
			rows = append(rows, []string{s.Config, s.Axle, cla(s.CLA), percent(s.PDownforce)})
		}
	}
	return rows
}

// standaloneTable writes the table of what one entry says on its own.
func (r *reporter) standaloneTable(id string) {
	r.pg.table([]column{{"configuration", 1.2, "L"}, {"axle", 0.8, "L"}, {symCLA + " alone (m²)", 2, "R"}, {"P(downforce)", 1.1, "R"}}, r.standaloneRows(id))
}
