package logs

import (
	"errors"
	"fmt"
	"strings"
)

// ErrBadFormat is wrapped by the errors of the Parse… functions below and of
// Format.Check: a format key with a value the reader cannot take.
var ErrBadFormat = errors.New("bad log format")

// Format says how a logger wrote its file. Every zero field is detected
// from the file (or takes its default) when the reader opens it; the
// reader's Detected method returns the format it settled on.
type Format struct {
	// Delimiter separates the cells: ',', ';' or '\t'. Zero: the first
	// of these with which a line holds every asked-for column.
	Delimiter byte
	// Decimal is the decimal mark, '.' or ',' (',' only with ';' or '\t').
	// Zero: ',' when the delimiter is not ',' and the first data rows write
	// numbers such as "12,5" (and none such as "12.5"), else '.'.
	Decimal byte
	// HeaderLine is the 1-based line of the header row; lines above it are
	// the logger's preamble. Zero: the first line that holds every
	// asked-for column (the first non-blank line when none are asked for).
	HeaderLine int
	// SkipLines is the number of lines right after the header to skip (a
	// units row, say). Zero: one line is skipped when the line right under
	// the header is a units row — it has a non-empty cell and no cell that
	// reads as a number or a time ("s", "km/h", "V"). NoSkip (negative):
	// none is skipped, nothing detected (a campaign's explicit
	// "skip_lines: 0").
	SkipLines int
	// Time is how the time column (the Column marked Time, else the
	// reader's Increasing column) is written. With TimeClock and TimeISO
	// the reader yields seconds from the log's first sample.
	Time TimeFormat
	// Empty is what an empty cell in an asked-for column means.
	Empty EmptyPolicy
}

// NoSkip as Format.SkipLines skips no line and detects no units row.
const NoSkip = -1

// TimeFormat is how time is written in a log.
type TimeFormat uint8

const (
	// TimeDetect: seconds when the first sample's time is a number, clock
	// or ISO when it reads as such.
	TimeDetect TimeFormat = iota
	// TimeSeconds: a decimal number of seconds, yielded as it is.
	TimeSeconds
	// TimeClock: time of day, h:mm:ss or hh:mm:ss with an optional
	// fraction (".fff", or ",fff" with the decimal comma). A clock that
	// goes back by more than 12 h is taken to have passed midnight.
	TimeClock
	// TimeISO: an RFC 3339 date-time ("2026-05-01T12:00:00.250+02:00");
	// a space may stand for the "T" and the zone may be left out (then
	// all rows are taken in one zone).
	TimeISO
)

var timeNames = [...]string{TimeDetect: "", TimeSeconds: "seconds", TimeClock: "clock", TimeISO: "iso"}

func (t TimeFormat) String() string {
	if int(t) < len(timeNames) && t != TimeDetect {
		return timeNames[t]
	}
	return "detect"
}

// ParseTimeFormat reads a campaign's time key: "seconds", "clock" or "iso"
// (any case); "" is TimeDetect.
func ParseTimeFormat(s string) (TimeFormat, error) {
	for i, n := range timeNames {
		if strings.EqualFold(strings.TrimSpace(s), n) {
			return TimeFormat(i), nil
		}
	}
	return 0, fmt.Errorf("%w: time %q (want seconds, clock or iso)", ErrBadFormat, s)
}

// EmptyPolicy is what an empty cell in an asked-for column means.
type EmptyPolicy uint8

const (
	// EmptyError: an empty cell is an error at its place (the default).
	EmptyError EmptyPolicy = iota
	// EmptyHold: the column's last value is held (mixed-rate loggers
	// leave a slow channel empty between its samples). Rows before every
	// asked-for column has had a value are dropped; an empty time cell is
	// still an error.
	EmptyHold
	// EmptySkip: a row with an empty asked-for cell is dropped.
	EmptySkip
)

var emptyNames = [...]string{EmptyError: "error", EmptyHold: "hold", EmptySkip: "skip"}

func (p EmptyPolicy) String() string {
	if int(p) < len(emptyNames) {
		return emptyNames[p]
	}
	return fmt.Sprintf("EmptyPolicy(%d)", p)
}

// ParseEmptyPolicy reads a campaign's empty key: "error", "hold" or "skip"
// (any case); "" is EmptyError.
func ParseEmptyPolicy(s string) (EmptyPolicy, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return EmptyError, nil
	}
	for i, n := range emptyNames {
		if strings.EqualFold(s, n) {
			return EmptyPolicy(i), nil
		}
	}
	return 0, fmt.Errorf("%w: empty %q (want error, hold or skip)", ErrBadFormat, s)
}

// ParseDelimiter reads a campaign's delimiter key: ",", ";", a tab (also
// written "\t" or "tab"); "" is detect.
func ParseDelimiter(s string) (byte, error) {
	switch strings.ToLower(s) {
	case "":
		return 0, nil
	case ",", "comma":
		return ',', nil
	case ";", "semicolon":
		return ';', nil
	case "\t", `\t`, "tab":
		return '\t', nil
	}
	return 0, fmt.Errorf("%w: delimiter %q (want \",\", \";\" or \"\\t\")", ErrBadFormat, s)
}

// ParseDecimal reads a campaign's decimal key: "." or ","; "" is detect.
func ParseDecimal(s string) (byte, error) {
	switch s {
	case "":
		return 0, nil
	case ".", ",":
		return s[0], nil
	}
	return 0, fmt.Errorf("%w: decimal %q (want \".\" or \",\")", ErrBadFormat, s)
}

// Check reports the first key of f that the reader cannot take.
func (f Format) Check() error {
	switch f.Delimiter {
	case 0, ',', ';', '\t':
	default:
		return fmt.Errorf("%w: delimiter %q (want \",\", \";\" or \"\\t\")", ErrBadFormat, f.Delimiter)
	}
	switch f.Decimal {
	case 0, '.':
	case ',':
		if f.Delimiter == ',' {
			return fmt.Errorf("%w: decimal \",\" needs the delimiter \";\" or \"\\t\"", ErrBadFormat)
		}
	default:
		return fmt.Errorf("%w: decimal %q (want \".\" or \",\")", ErrBadFormat, f.Decimal)
	}
	switch {
	case f.HeaderLine < 0:
		return fmt.Errorf("%w: header_line %d (want 1 or more)", ErrBadFormat, f.HeaderLine)
	case f.Time > TimeISO:
		return fmt.Errorf("%w: time %d", ErrBadFormat, f.Time)
	case f.Empty > EmptySkip:
		return fmt.Errorf("%w: empty %d", ErrBadFormat, f.Empty)
	}
	return nil
}

// String describes a format for a person, e.g.
// `delimiter ";", decimal ",", header on line 3, 1 units row skipped, clock time`.
func (f Format) String() string {
	var parts []string
	if f.Delimiter != 0 {
		parts = append(parts, "delimiter "+quoteByte(f.Delimiter))
	}
	if f.Decimal != 0 {
		parts = append(parts, "decimal "+quoteByte(f.Decimal))
	}
	if f.HeaderLine > 0 {
		parts = append(parts, fmt.Sprintf("header on line %d", f.HeaderLine))
	}
	switch {
	case f.SkipLines <= 0:
	case f.SkipLines == 1:
		parts = append(parts, "1 units row skipped")
	default:
		parts = append(parts, fmt.Sprintf("%d lines skipped after the header", f.SkipLines))
	}
	if f.Time != TimeDetect {
		parts = append(parts, f.Time.String()+" time")
	}
	if f.Empty != EmptyError {
		parts = append(parts, "empty cells: "+f.Empty.String())
	}
	if len(parts) == 0 {
		return "detected on reading"
	}
	return strings.Join(parts, ", ")
}

func quoteByte(c byte) string {
	if c == '\t' {
		return `"\t"`
	}
	return `"` + string(rune(c)) + `"`
}
