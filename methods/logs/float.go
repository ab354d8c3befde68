package logs

import (
	"math"
	"strconv"
)

// pow10 holds the powers of ten that float64 represents exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// ParseFloat parses a decimal number from b and returns exactly what
// strconv.ParseFloat(string(b), 64) returns for it.
//
// Ordinary log values (at most 15 significant digits, a decimal exponent of
// at most 22 in size) take Clinger's fast path: both the integer mantissa m
// and 10^e are exact doubles, so the single correctly rounded product or
// quotient m·10^e is the correctly rounded value of the decimal.
//
//	W. D. Clinger, "How to read floating point numbers accurately",
//	PLDI 1990, section 4 (the "fast path").
//
// Everything else falls back to strconv, which is exact but allocates.
func ParseFloat(b []byte) (float64, error) {
	if f, ok := fastFloat(b); ok {
		return f, nil
	}
	return strconv.ParseFloat(string(b), 64)
}

func fastFloat(b []byte) (float64, bool) {
	i, n := 0, len(b)
	if n == 0 {
		return 0, false
	}
	neg := false
	switch b[0] {
	case '-':
		neg = true
		i++
	case '+':
		i++
	}
	var mant uint64
	digits, exp := 0, 0
	sawDigit, sawDot := false, false
	for ; i < n; i++ {
		c := b[i]
		switch {
		case c >= '0' && c <= '9':
			sawDigit = true
			if mant == 0 && c == '0' {
				if sawDot {
					exp--
				}
				continue
			}
			if digits >= 15 {
				return 0, false
			}
			mant = mant*10 + uint64(c-'0')
			digits++
			if sawDot {
				exp--
			}
		case c == '.' && !sawDot:
			sawDot = true
		case c == 'e' || c == 'E':
			if !sawDigit {
				return 0, false
			}
			e, ok := smallExp(b[i+1:])
			if !ok {
				return 0, false
			}
			exp += e
			i = n
		default:
			return 0, false
		}
	}
	if !sawDigit {
		return 0, false
	}
	f := float64(mant)
	switch {
	case mant == 0:
		f = 0
	case exp == 0:
	case exp > 0 && exp <= 22:
		f *= pow10[exp]
	case exp < 0 && exp >= -22:
		f /= pow10[-exp]
	default:
		return 0, false
	}
	if neg {
		f = math.Copysign(f, -1)
	}
	return f, true
}

// smallExp reads a decimal exponent of at most three digits.
func smallExp(b []byte) (int, bool) {
	if len(b) == 0 {
		return 0, false
	}
	neg := false
	switch b[0] {
	case '-':
		neg = true
		b = b[1:]
	case '+':
		b = b[1:]
	}
	if len(b) == 0 || len(b) > 3 {
		return 0, false
	}
	e := 0
	for _, c := range b {
		if c < '0' || c > '9' {
			return 0, false
		}
		e = e*10 + int(c-'0')
	}
	if neg {
		e = -e
	}
	return e, true
}
