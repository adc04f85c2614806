package importers

import "math"

// pow10 holds the powers of ten a float64 represents exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10,
	1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// fastDecimal parses the plain decimal numbers tables are made of
// ([+-]digits[.digits][e[+-]digits]) when the result is exact by Clinger's
// fast path (Clinger 1990, "How to read floating point numbers accurately",
// PLDI): a mantissa below 2^53 times or over an exactly representable power
// of ten is correctly rounded by one IEEE operation. It reports false for
// anything else, which strconv.ParseFloat then reads; both give the same
// bits wherever fastDecimal answers (FuzzNumber checks this).
func fastDecimal(s string) (float64, bool) {
	i, neg := 0, false
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		neg = s[i] == '-'
		i++
	}
	var mant uint64
	digits, exp := 0, 0 // significant digits kept; decimal exponent
	sawDigit := false
	for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
		sawDigit = true
		if mant == 0 && s[i] == '0' {
			continue
		}
		if digits == 19 {
			return 0, false
		}
		mant = mant*10 + uint64(s[i]-'0')
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			sawDigit = true
			exp--
			if mant == 0 && s[i] == '0' {
				continue
			}
			if digits == 19 {
				return 0, false
			}
			mant = mant*10 + uint64(s[i]-'0')
			digits++
		}
	}
	if !sawDigit {
		return 0, false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		eneg := false
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			eneg = s[i] == '-'
			i++
		}
		if i == len(s) {
			return 0, false
		}
		e := 0
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			if e > 10000 {
				return 0, false
			}
			e = e*10 + int(s[i]-'0')
		}
		if eneg {
			e = -e
		}
		exp += e
	}
	if i != len(s) {
		return 0, false
	}
	if mant == 0 {
		if neg {
			return math.Copysign(0, -1), true
		}
		return 0, true
	}
	if mant >= 1<<53 || exp < -22 || exp > 22 {
		return 0, false
	}
	f := float64(mant)
	if exp >= 0 {
		f *= pow10[exp]
	} else {
		f /= pow10[-exp]
	}
	if neg {
		f = -f
	}
	return f, true
}
