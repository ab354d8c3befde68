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
package report
