package campaign

import (
	"strconv"
	"strings"
)

// WordList writes names as a person would: "a", "a and b", "a, b and c",
// each quoted.
func WordList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = strconv.Quote(n)
	}
	switch len(q) {
	case 0:
		return "none"
	case 1:
		return q[0]
	}
	return strings.Join(q[:len(q)-1], ", ") + " and " + q[len(q)-1]
}
