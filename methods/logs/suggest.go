package logs

import (
	"errors"
	"fmt"
	"strings"
	"unicode/utf8"
)

// ClosestName returns the name among names nearest to want: an equal name
// ignoring case first, else the one at the smallest edit distance
// (Levenshtein, counted in characters, ignoring case) when that distance is
// at most a third of want's length (at least 1, at most 3). ok is false
// when no name is that close.
//
//	V. I. Levenshtein, "Binary codes capable of correcting deletions,
//	insertions, and reversals", Soviet Physics Doklady 10(8), 1966.
func ClosestName(want string, names []string) (string, bool) {
	for _, n := range names {
		if strings.EqualFold(n, want) {
			return n, true
		}
	}
	limit := min(max(utf8.RuneCountInString(want)/3, 1), 3)
	best, bestD := "", limit+1
	w := []rune(strings.ToLower(want))
	for _, n := range names {
		if d := editDistance(w, []rune(strings.ToLower(n))); d < bestD {
			best, bestD = n, d
		}
	}
	return best, bestD <= limit
}

// editDistance is the Levenshtein distance of a and b by the two-row
// dynamic programme (Wagner and Fischer, J. ACM 21(1), 1974).
func editDistance(a, b []rune) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			sub := prev[j-1]
			if a[i-1] != b[j-1] {
				sub++
			}
			cur[j] = min(sub, prev[j]+1, cur[j-1]+1)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// maxListed is how many header names a missing-column message lists.
const maxListed = 24

// missingColumn is the error for one asked-for column the header lacks: it
// lists the header's columns and names the closest one.
func missingColumn(want string, names []string) error {
	shown := names
	more := ""
	if len(shown) > maxListed {
		shown, more = shown[:maxListed], fmt.Sprintf(", … %d more", len(names)-maxListed)
	}
	hint := ""
	if c, ok := ClosestName(want, names); ok {
		hint = fmt.Sprintf("; did you mean %q?", c)
	} else if len(names) == 1 && strings.ContainsAny(names[0], ",;\t") {
		hint = "; is the delimiter right?"
	}
	return fmt.Errorf("%w (columns: %s%s)%s", ErrNoColumn, strings.Join(shown, ", "), more, hint)
}

// ParseErrors returns the ParseErrors in err: err itself, or each one of
// an errors.Join (a reader reports every missing column at once).
func ParseErrors(err error) []*ParseError {
	if err == nil {
		return nil
	}
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		var out []*ParseError
		for _, e := range j.Unwrap() {
			out = append(out, ParseErrors(e)...)
		}
		return out
	}
	var pe *ParseError
	if errors.As(err, &pe) {
		return []*ParseError{pe}
	}
	return nil
}
