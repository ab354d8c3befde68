package fuse

import (
	"slices"
	"testing"
)

// TestArena: kept slices hold copies of what was kept, however the
// source changes after, none for an empty list, across chunks, and an
// append to one moves it rather than overwrite the slice kept after it.
func TestArena(t *testing.T) {
	var a arena[entryRef]
	if got := a.keep(nil); got != nil {
		t.Errorf("keep(nil) = %v, want nil", got)
	}
	src := make([]entryRef, 0, 8)
	var kept [][]entryRef
	var want [][]entryRef
	for i := range 3 * arenaChunk / 5 { // lists of 1 to 9: past two chunks
		src = src[:0]
		for k := range 1 + i%9 {
			src = append(src, entryRef{i, float64(k)})
		}
		kept = append(kept, a.keep(src))
		want = append(want, slices.Clone(src))
		src[0].v = -1 // the source reused, as indexRow does
	}
	kept[0] = append(kept[0], entryRef{-5, -5})
	for i := range kept {
		w := want[i]
		if i == 0 {
			w = append(w, entryRef{-5, -5})
		}
		if !slices.Equal(kept[i], w) {
			t.Fatalf("list %d: %v, want %v", i, kept[i], w)
		}
		if i > 0 && cap(kept[i]) != len(kept[i]) {
			t.Fatalf("list %d: capacity %d, length %d", i, cap(kept[i]), len(kept[i]))
		}
	}
}
