package report

import "testing"

// TestCount: counts in words with the regular English plurals (from
// memory: a consonant before a final "y" makes "-ies", a final s, x, z,
// ch or sh takes "-es", otherwise "-s"); exactly one is singular, zero is
// plural.
func TestCount(t *testing.T) {
	tests := []struct {
		name string
		n    int
		noun string
		want string
	}{
		{"one is singular", 1, "warning", "1 warning"},
		{"two is plural", 2, "warning", "2 warnings"},
		{"zero is plural", 0, "warning", "0 warnings"},
		{"consonant y", 3, "entry", "3 entries"},
		{"vowel y", 2, "day", "2 days"},
		{"ch takes es", 2, "patch", "2 patches"},
		{"s takes es", 4, "bus", "4 buses"},
		{"x takes es", 2, "box", "2 boxes"},
		{"only the last word", 3, "evidence entry", "3 evidence entries"},
		{"two words, one", 1, "measurement method", "1 measurement method"},
		{"irregular", 2, "axis", "2 axes"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := Count(tt.n, tt.noun); got != tt.want {
				t.Errorf("Count(%d, %q) = %q, want %q", tt.n, tt.noun, got, tt.want)
			}
		})
	}
}

// TestList: lists as in a sentence, without the serial comma (common
// practice, no source), never Go's "[a b]".
func TestList(t *testing.T) {
	tests := []struct {
		name  string
		items []string
		and   string
	}{
		{"none", nil, "none"},
		{"one", []string{"stock"}, "stock"},
		{"two", []string{"stock", "extended"}, "stock and extended"},
		{"three", []string{"front", "rear", "total"}, "front, rear and total"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := List(tt.items); got != tt.and {
				t.Errorf("List = %q, want %q", got, tt.and)
			}
		})
	}
}
