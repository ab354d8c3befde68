// Package report lays out what package fuse returns: the customer
// development report (PDF), the result document (JSON) and terminal tables.
// It computes no statistics of its own: every figure at a speed is read
// from the result document at that speed (speeds.go), and curves and
// balances come from fuse's posterior.
//
// The PDF is a neutral, print-friendly layout of our own: page 1 answers
// the customer (what each configuration does at the report speeds, what
// changed and how sure we are, what disagreed, what to do next); then lift
// against speed, where the sensors were, the detailed tables, each method,
// agreement, the plan, notes, the run log and provenance. Black text on
// white, grey rules; charts tell the configurations apart by the Okabe–Ito
// colour-blind-safe colours and by marker shape, so that they read on a
// mono printer too. Symbols are set with real subscripts (rich.go).
//
// Each measurement method's sections, charts and reduce tables are in a
// file of its own (height.go, pressure.go, vortex.go), listed once in
// methodReports (methods.go); the sections every report has are in
// cover.go, agreement.go, plan.go and notes.go, in the order pdf.go calls
// them.
//
// Counts and lists are written in words by one helper (words.go: Count,
// List), units as in the rest of the tool (m², forces in the campaign's
// report.force_unit in every command). Which fusion the headline figures
// are and the model checks that tripped are read in one place
// (headline.go). No input makes the report panic: chart data pass through
// chartdata.go, which leaves out what no axis can show and says so, and a
// chart that still cannot be drawn becomes a note; the title, the number
// of report speeds and of configurations are laid out in bounded space
// (three title lines on page 1, prose of at most four speeds and six
// changes, charts of at most eight configurations — every figure stays in
// the tables).
package report
