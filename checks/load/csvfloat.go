package load

// exact10 are the powers of ten that float64 holds exactly.
var exact10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// plainDecimal converts a plain decimal ([+-]digits[.digits], at most 19
// digits, so at most 19 decimals, and a mantissa below 2^53) directly, as
// strconv.ParseFloat would: the mantissa and the power of ten are both
// exact in float64, so one division rounds correctly (Clinger 1990, "How
// to read floating point numbers accurately", the fast path strconv takes
// too). For anything else it returns false and the caller asks strconv.
// b is not empty.
func plainDecimal(b []byte) (float64, bool) {
	i, neg := 0, false
	if b[0] == '-' || b[0] == '+' {
		i, neg = 1, b[0] == '-'
	}
	m, i, whole := digitsAt(b, i, 0)
	frac := 0
	if i < len(b) && b[i] == '.' {
		m, i, frac = digitsAt(b, i+1, m)
	}
	if i != len(b) || whole+frac == 0 || whole+frac > 19 || m >= 1<<53 {
		return 0, false
	}
	x := float64(m) / exact10[frac]
	if neg {
		x = -x
	}
	return x, true
}

// digitsAt reads the decimal digits of b from i on into m; it returns m,
// where the digits end and how many there were. Past 19 digits m
// overflows, and plainDecimal gives up.
func digitsAt(b []byte, i int, m uint64) (uint64, int, int) {
	from := i
	for ; i < len(b) && b[i]-'0' < 10; i++ {
		m = m*10 + uint64(b[i]-'0')
	}
	return m, i, i - from
}
