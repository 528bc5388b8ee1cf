package load

import (
	"strconv"
	"unsafe"
)

// exact10 are the powers of ten that float64 holds exactly.
var exact10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// parseFloat is strconv.ParseFloat(b, 64) without copying b. A plain
// decimal ([+-]digits[.digits], at most 19 digits, so at most 19
// decimals, and a mantissa below 2^53) is converted directly: the mantissa and the
// power of ten are both exact in float64, so one division rounds
// correctly (Clinger 1990, "How to read floating point numbers
// accurately", the fast path strconv takes too); anything else goes to
// strconv. b is not empty.
func parseFloat(b []byte) (float64, error) {
	if x, ok := plainDecimal(b); ok {
		return x, nil
	}
	return strconv.ParseFloat(unsafe.String(&b[0], len(b)), 64)
}

func plainDecimal(b []byte) (float64, bool) {
	i, neg := 0, false
	if b[0] == '-' || b[0] == '+' {
		i, neg = 1, b[0] == '-'
	}
	var m uint64
	digits, frac, dot := 0, 0, false
	for ; i < len(b); i++ {
		switch c := b[i]; {
		case c >= '0' && c <= '9':
			m = m*10 + uint64(c-'0')
			digits++
			if dot {
				frac++
			}
		case c == '.' && !dot:
			dot = true
		default:
			return 0, false
		}
	}
	if digits == 0 || digits > 19 || m >= 1<<53 {
		return 0, false
	}
	x := float64(m) / exact10[frac]
	if neg {
		x = -x
	}
	return x, true
}
