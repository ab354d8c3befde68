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
