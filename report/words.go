package report

import (
	"fmt"
	"strings"

	"liftfuse/methods/campaign"
)

// The report writes counts and lists in words, the same way in the PDF and
// in every command's terminal text: "1 warning", "2 warnings", "stock and
// extended", "front, rear or total" — never Go's "[stock extended]" nor
// "1 warnings". The rules are the regular English plurals (a consonant
// before a final "y" makes "-ies"; a final s, x, z, ch or sh takes "-es";
// otherwise "-s"), as any grammar gives them (from memory); the serial
// comma is not used, as in the rest of the report.

// Count is n with its noun in the singular or the plural: Count(1,
// "warning") is "1 warning", Count(3, "evidence entry") is "3 evidence
// entries". Only the last word of the noun is made plural.
func Count(n int, noun string) string {
	return fmt.Sprintf("%d %s", n, Plural(n, noun))
}

// Plural is the noun for n of it: the singular for exactly one, else the
// plural of its last word.
func Plural(n int, noun string) string {
	if n == 1 || noun == "" {
		return noun
	}
	head, last := "", noun
	if i := strings.LastIndexByte(noun, ' '); i >= 0 {
		head, last = noun[:i+1], noun[i+1:]
	}
	return head + pluralWord(last)
}

// irregular are the plurals of the report's words that no rule gives.
var irregular = map[string]string{"axis": "axes", "datum": "data", "criterion": "criteria"}

// pluralWord is the plural of one English word by the regular rules.
func pluralWord(w string) string {
	if p, ok := irregular[w]; ok {
		return p
	}
	lower := strings.ToLower(w)
	switch {
	case strings.HasSuffix(lower, "y") && len(w) > 1 && !strings.ContainsRune("aeiou", rune(lower[len(lower)-2])):
		return w[:len(w)-1] + "ies"
	case strings.HasSuffix(lower, "s"), strings.HasSuffix(lower, "x"), strings.HasSuffix(lower, "z"),
		strings.HasSuffix(lower, "ch"), strings.HasSuffix(lower, "sh"):
		return w + "es"
	}
	return w + "s"
}

// List writes items as in a sentence: "a", "a and b", "a, b and c"; no
// items is "none".
func List(items []string) string { return campaign.Words(items, "and") }

// join joins with commas and a final separator ("a, b" + last + "c"), for
// the sentences that need one other than " and " ("; and ").
func join(parts []string, last string) string {
	switch len(parts) {
	case 0:
		return ""
	case 1:
		return parts[0]
	}
	return strings.Join(parts[:len(parts)-1], ", ") + last + parts[len(parts)-1]
}

// count is Count, as the package's sentences call it.
func count(n int, noun string) string { return Count(n, noun) }
