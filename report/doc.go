// Package report lays out what package fuse returns: the customer
// development report (PDF), the result document (JSON) and terminal tables.
// It computes no statistics of its own.
//
// The PDF is a neutral, print-friendly layout of our own: black text on
// white, grey rules, charts in shades of grey with marker shapes telling the
// configurations apart, so that it reads the same on a mono printer.
//
// Each measurement method's sections, charts and reduce tables are in a
// file of its own (height.go, pressure.go, vortex.go), listed once in
// methodReports (methods.go); the sections every report has are in
// cover.go, agreement.go, plan.go and notes.go, in the order pdf.go calls
// them.
package report
