package main

import "testing"

// TestWords: lists and counts as in English prose (common practice, no
// source; the serial comma is not used, as in the rest of the messages).
func TestWords(t *testing.T) {
	tests := []struct {
		name string
		list []string
		conj string
		want string
	}{
		{"none", nil, "and", ""},
		{"one", []string{"stock"}, "and", "stock"},
		{"two", []string{"stock", "extended"}, "and", "stock and extended"},
		{"three", []string{"front", "rear", "total"}, "or", "front, rear or total"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := words(tt.list, tt.conj); got != tt.want {
				t.Errorf("words(%q) = %q, want %q", tt.list, got, tt.want)
			}
		})
	}
}
