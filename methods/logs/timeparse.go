package logs

// Clock and RFC 3339 times are read to whole nanoseconds (int64), so that
// the seconds from the first sample, float64(ns−ns₀)/1e9, is one correctly
// rounded division of exact integers: "12:00:00.1" after "12:00:00.0" gives
// the same bits as the number "0.1". Fraction digits past the ninth are
// dropped.

const (
	nsPerSec = int64(1_000_000_000)
	nsPerDay = 86_400 * nsPerSec
)

// digits2 reads exactly two decimal digits.
func digits2(b []byte) (int, bool) {
	if len(b) < 2 || b[0]-'0' > 9 || b[1]-'0' > 9 {
		return 0, false
	}
	return int(b[0]-'0')*10 + int(b[1]-'0'), true
}

// fracNanos reads the fraction digits after a decimal mark as nanoseconds;
// it returns the nanoseconds and the bytes taken (at least one digit).
func fracNanos(b []byte) (int64, int) {
	var ns int64
	scale := nsPerSec
	i := 0
	for ; i < len(b) && b[i]-'0' <= 9; i++ {
		if scale > 1 {
			scale /= 10
			ns += int64(b[i]-'0') * scale
		}
	}
	return ns, i
}

// clockNanos reads a time of day, h:mm:ss or hh:mm:ss with an optional
// fraction after '.' or dec, as nanoseconds since midnight.
func clockNanos(b []byte, dec byte) (int64, bool) {
	h := 0
	switch {
	case len(b) >= 2 && b[1] == ':' && b[0]-'0' <= 9:
		h = int(b[0] - '0')
		b = b[2:]
	case len(b) >= 3 && b[2] == ':':
		var ok bool
		if h, ok = digits2(b); !ok {
			return 0, false
		}
		b = b[3:]
	default:
		return 0, false
	}
	m, ok1 := digits2(b)
	if !ok1 || len(b) < 5 || b[2] != ':' {
		return 0, false
	}
	s, ok2 := digits2(b[3:])
	if !ok2 || h > 23 || m > 59 || s > 59 {
		return 0, false
	}
	ns := (int64(h)*3600 + int64(m)*60 + int64(s)) * nsPerSec
	b = b[5:]
	if len(b) == 0 {
		return ns, true
	}
	if b[0] != '.' && b[0] != dec {
		return 0, false
	}
	f, n := fracNanos(b[1:])
	if n == 0 || n+1 != len(b) {
		return 0, false
	}
	return ns + f, true
}

// isoNanos reads an RFC 3339 date-time (RFC 3339 section 5.6:
// full-date "T" full-time) as nanoseconds since 1970-01-01T00:00:00Z. As
// the RFC's section 5.6 note allows, a space or lower-case "t" may stand
// for the "T"; the fraction may follow '.' or ','; a missing zone is taken
// as UTC. Leap seconds (:60) are refused, as Go's time package does, and
// so are years outside 1700–2200.
func isoNanos(b []byte) (int64, bool) {
	if len(b) < 19 || b[4] != '-' || b[7] != '-' || b[13] != ':' || b[16] != ':' {
		return 0, false
	}
	if c := b[10]; c != 'T' && c != 't' && c != ' ' {
		return 0, false
	}
	y1, ok1 := digits2(b)
	y2, ok2 := digits2(b[2:])
	mo, ok3 := digits2(b[5:])
	d, ok4 := digits2(b[8:])
	h, ok5 := digits2(b[11:])
	mi, ok6 := digits2(b[14:])
	s, ok7 := digits2(b[17:])
	if !(ok1 && ok2 && ok3 && ok4 && ok5 && ok6 && ok7) {
		return 0, false
	}
	y := y1*100 + y2
	if y < 1700 || y > 2200 { // int64 nanoseconds span 1678–2262
		return 0, false
	}
	if mo < 1 || mo > 12 || d < 1 || d > daysIn(y, mo) || h > 23 || mi > 59 || s > 59 {
		return 0, false
	}
	ns := daysFromCivil(y, mo, d)*nsPerDay + (int64(h)*3600+int64(mi)*60+int64(s))*nsPerSec
	b = b[19:]
	if len(b) > 0 && (b[0] == '.' || b[0] == ',') {
		f, n := fracNanos(b[1:])
		if n == 0 {
			return 0, false
		}
		ns += f
		b = b[1+n:]
	}
	switch {
	case len(b) == 0:
		return ns, true
	case len(b) == 1 && (b[0] == 'Z' || b[0] == 'z'):
		return ns, true
	case len(b) == 6 && (b[0] == '+' || b[0] == '-') && b[3] == ':':
		oh, ok1 := digits2(b[1:])
		om, ok2 := digits2(b[4:])
		if !ok1 || !ok2 || oh > 23 || om > 59 {
			return 0, false
		}
		off := (int64(oh)*3600 + int64(om)*60) * nsPerSec
		if b[0] == '+' {
			off = -off // local time = UTC + offset
		}
		return ns + off, true
	}
	return 0, false
}

func daysIn(y, m int) int {
	switch m {
	case 2:
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

// daysFromCivil returns the days from 1970-01-01 to the proleptic Gregorian
// date y-m-d (H. Hinnant, "chrono-Compatible Low-Level Date Algorithms",
// 2013, days_from_civil): eras of 400 years of 146097 days, years counted
// from March so that the leap day ends the year.
func daysFromCivil(y, m, d int) int64 {
	if m <= 2 {
		y--
	}
	era := y / 400
	if y < 0 {
		era = (y - 399) / 400 // floor division
	}
	yoe := y - era*400
	mp := (m + 9) % 12
	doy := (153*mp+2)/5 + d - 1
	doe := yoe*365 + yoe/4 - yoe/100 + doy
	return int64(era)*146097 + int64(doe) - 719468
}
