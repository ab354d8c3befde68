package checks_test

import (
	"bufio"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/sim/reality"
)

// day is a clean test day of the independent simulator (methods/sim/reality,
// which shares no code with the adapters): its invented coupe with two pots,
// a rear laser and roof-and-floor taps, the stated springs, tyres, drag,
// gains and tyre growth drawn about the true ones with their stated
// uncertainty, suspension friction of 0.15 mm. Odd seeds draw the
// configurations' lift from the prior (sd 0.2 m², with speed slopes:
// speed_model linear), even seeds keep the default day's lift (constant).
func day(seed int64) *reality.Day {
	d := reality.Default()
	if seed%2 == 1 {
		d.DrawLift(seed, 0.2, true)
	}
	return d
}

// simulate writes a day, lets plant change its files, loads and reduces it.
func simulate(t *testing.T, d *reality.Day, seed int64, plant func(t *testing.T, dir string)) (*campaign.Campaign, *methods.Reduced) {
	t.Helper()
	dir := t.TempDir()
	if _, err := d.Write(dir, seed); err != nil {
		t.Fatal(err)
	}
	if plant != nil {
		plant(t, dir)
	}
	c, err := campaign.Load(filepath.Join(dir, reality.CampaignFile), campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return c, r
}

// editCSV rewrites a CSV file cell by cell: f gets the header, the row and
// the column index and returns the new cell.
func editCSV(t *testing.T, path string, f func(head, row []string, k int) string) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out strings.Builder
	sc := bufio.NewScanner(strings.NewReader(string(b)))
	var head []string
	for sc.Scan() {
		cells := strings.Split(sc.Text(), ",")
		if head == nil {
			head = cells
			out.WriteString(sc.Text() + "\n")
			continue
		}
		next := make([]string, len(cells))
		for k := range cells {
			next[k] = f(head, cells, k)
		}
		out.WriteString(strings.Join(next, ",") + "\n")
	}
	if err := os.WriteFile(path, []byte(out.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

func cell(head, row []string, name string) float64 {
	for k, h := range head {
		if h == name {
			v, _ := strconv.ParseFloat(row[k], 64)
			return v
		}
	}
	return math.NaN()
}
