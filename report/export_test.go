package report

// Findings returns the sentences of page 1's "What we found", for the
// tests of package report_test.
func Findings(in Input) ([]string, error) {
	r, err := newReporter(in)
	if err != nil {
		return nil, err
	}
	return r.findings(), nil
}

// PDFUncompressed renders the report with its streams left uncompressed,
// so that a test can read the drawing operators.
func PDFUncompressed(in Input) ([]byte, error) {
	compress = false
	defer func() { compress = true }()
	return PDF(in)
}

// Checks returns the bullets of page 1's "Checks", for the tests of
// package report_test.
func Checks(in Input) ([]string, error) {
	r, err := newReporter(in)
	if err != nil {
		return nil, err
	}
	return r.checks(), nil
}
