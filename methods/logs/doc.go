// Package logs reads sampled test-day logs as a stream: memory does not
// grow with the length of the file, and every bad cell is an error naming
// the file, line and column.
//
// A log is a header row naming the columns and one row per sample. The
// format 1 file is comma-separated with '.' as the decimal mark and time
// in seconds; a Format describes how else a logger may have written it —
// ';' or tab cells, the decimal comma, a preamble above the header, a
// units row under it, clock or RFC 3339 time, empty cells of a slow
// channel — and every key it leaves zero is detected from the head of the
// file (Reader.Detected tells what was settled on). A UTF-8 byte-order
// mark is always skipped.
//
// Typical use:
//
//	r, err := logs.NewReaderFormat(f, name, []logs.Column{{Name: "t", Time: true}, {Name: "v"}}, format)
//	// err: every missing column at once (logs.ParseErrors), each with the
//	// header's columns and the closest name
//	defer r.Close()
//	for r.Next() {
//		t, v := r.Float(0), r.Float(1)
//	}
//	err = r.Err()
//
// Interp joins a column of another log (speed from a GPS) by time.
package logs
