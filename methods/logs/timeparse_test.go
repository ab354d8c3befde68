package logs

import (
	"math/rand/v2"
	"testing"
	"time"
)

// TestISOTimes: RFC 3339 times read as Go's time package reads them (the
// reference library); the first four are RFC 3339 section 5.8's examples.
func TestISOTimes(t *testing.T) {
	tests := []struct {
		name, s string
		ok      bool
	}{
		{"RFC 3339 5.8 UTC with fraction", "1985-04-12T23:20:50.52Z", true},
		{"RFC 3339 5.8 negative offset", "1996-12-19T16:39:57-08:00", true},
		{"RFC 3339 5.8 leap second refused", "1990-12-31T23:59:60Z", false},
		{"RFC 3339 5.8 odd offset", "1937-01-01T12:00:27.87+00:20", true},
		{"nanoseconds", "2026-05-01T12:00:00.123456789+02:00", true},
		{"comma fraction", "2026-05-01T12:00:00,5Z", true},
		{"leap day", "2024-02-29T00:00:00Z", true},
		{"no leap day in 2100", "2100-02-29T00:00:00Z", false},
		{"hour 24", "2026-05-01T24:00:00Z", false},
		{"bare date", "2026-05-01", false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, ok := isoNanos([]byte(tt.s))
			if ok != tt.ok {
				t.Fatalf("isoNanos(%q) ok = %v, want %v", tt.s, ok, tt.ok)
			}
			if !ok {
				return
			}
			want, err := time.Parse(time.RFC3339Nano, tt.s)
			if err != nil || got != want.UnixNano() {
				t.Errorf("isoNanos(%q) = %d, time.Parse gives %d (%v)", tt.s, got, want.UnixNano(), err)
			}
		})
	}
	// The forms RFC 3339 section 5.6's note allows, and no zone (taken as UTC).
	for _, s := range []string{"2026-05-01 12:00:00Z", "2026-05-01t12:00:00z", "2026-05-01T12:00:00"} {
		got, ok := isoNanos([]byte(s))
		if want := time.Date(2026, 5, 1, 12, 0, 0, 0, time.UTC).UnixNano(); !ok || got != want {
			t.Errorf("isoNanos(%q) = %d, %v; want %d", s, got, ok, want)
		}
	}
}

// TestDaysFromCivil against Go's calendar (the reference library) on
// seeded dates over the years the reader takes.
func TestDaysFromCivil(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for range 5000 {
		y, m, d := 1700+rng.IntN(501), 1+rng.IntN(12), 1+rng.IntN(28)
		want := time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC).Unix() / 86400
		if got := daysFromCivil(y, m, d); got != want {
			t.Fatalf("daysFromCivil(%d, %d, %d) = %d, want %d", y, m, d, got, want)
		}
	}
}

func TestClockTimes(t *testing.T) {
	tests := []struct {
		name, s string
		want    int64 // nanoseconds after midnight, or −1
	}{
		{"whole seconds", "23:59:59", (23*3600 + 59*60 + 59) * nsPerSec},
		{"one-digit hour", "7:05:00.25", (7*3600+5*60)*nsPerSec + 250_000_000},
		{"decimal comma fraction", "00:00:01,5", 1_500_000_000},
		{"digits past nanoseconds dropped", "00:00:00.1234567891", 123_456_789},
		{"minute 60 refused", "12:60:00", -1},
		{"no seconds refused", "12:30", -1},
		{"trailing junk refused", "12:30:00.5s", -1},
		{"empty fraction refused", "12:30:00.", -1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got, ok := clockNanos([]byte(tt.s), ',')
			if (tt.want >= 0) != ok || (ok && got != tt.want) {
				t.Errorf("clockNanos(%q) = %d, %v; want %d", tt.s, got, ok, tt.want)
			}
		})
	}
}

// FuzzISOTime: wherever Go's time package reads an RFC 3339 time, the
// reader gives the same instant or refuses it (it is stricter on zone
// hours and the year range).
func FuzzISOTime(f *testing.F) {
	for _, s := range []string{"1985-04-12T23:20:50.52Z", "1996-12-19T16:39:57-08:00", "2026-05-01T12:00:00,5+01:00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got, ok := isoNanos([]byte(s))
		want, err := time.Parse(time.RFC3339Nano, s)
		if ok && err == nil && got != want.UnixNano() {
			t.Fatalf("isoNanos(%q) = %d, time.Parse gives %d", s, got, want.UnixNano())
		}
	})
}

// FuzzClockTime: a clock time that reads gives a time of day.
func FuzzClockTime(f *testing.F) {
	f.Add("12:00:00.5")
	f.Add("1:02:03")
	f.Fuzz(func(t *testing.T, s string) {
		if ns, ok := clockNanos([]byte(s), ','); ok && (ns < 0 || ns >= nsPerDay) {
			t.Fatalf("clockNanos(%q) = %d, outside a day", s, ns)
		}
	})
}
