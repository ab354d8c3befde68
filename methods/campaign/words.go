package campaign

import (
	"strconv"
	"strings"
)

// Words writes a list as in a sentence: "a", "a and b", "a, b and c" (conj
// "and" or "or"); "none" for an empty list.
func Words(list []string, conj string) string {
	switch len(list) {
	case 0:
		return "none"
	case 1:
		return list[0]
	}
	return strings.Join(list[:len(list)-1], ", ") + " " + conj + " " + list[len(list)-1]
}

// WordList is Words with each name quoted: `"a", "b" and "c"`.
func WordList(names []string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = strconv.Quote(n)
	}
	return Words(q, "and")
}
