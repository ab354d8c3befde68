package campaign_test

import (
	"bytes"
	"os"
	"testing"

	"liftfuse/methods/campaign"
)

// FuzzParse: no campaign text may panic the loader; a failure is always
// Problems with positions.
func FuzzParse(f *testing.F) {
	seed, err := os.ReadFile("../../testdata/mini/campaign.yaml")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(seed)
	f.Add([]byte("liftfuse: 1\n"))
	f.Add([]byte("liftfuse: 2\n"))
	f.Add([]byte("- a\n- b\n"))
	f.Add([]byte("a: &x [*x]\n"))
	f.Add([]byte("vehicle: {axles: {front: {spring_n_per_mm: .nan}}}\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := campaign.Parse(bytes.NewReader(data), "fuzz.yaml", "../../testdata/mini", campaign.Options{})
		if err == nil {
			if c == nil {
				t.Fatal("nil campaign without error")
			}
			return
		}
		probs, ok := err.(campaign.Problems)
		if !ok || len(probs) == 0 {
			t.Fatalf("error is %T, want non-empty Problems: %v", err, err)
		}
	})
}
