package render

import (
	"math"
	"regexp"
	"strconv"
	"strings"
)

// Minus is the one minus sign the pages print (U+2212).
const Minus = "\u2212"

// notAvailable stands where a number could not be computed.
const notAvailable = "not computed"

// Words turns a report token (not_applicable, high-concern, direct_effect)
// into words.
func Words(token string) string { return strings.NewReplacer("_", " ", "-", " ").Replace(token) }

// Num formats x with d decimals and the typographic minus sign; a value
// that rounds to zero prints without a sign.
func Num(x float64, d int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return notAvailable
	}
	s := strconv.FormatFloat(x, 'f', d, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	return strings.Replace(s, "-", Minus, 1)
}

// numPtr formats *p, or says it was not computed.
func numPtr(p *float64, d int) string {
	if p == nil {
		return notAvailable
	}
	return Num(*p, d)
}

// interval formats a confidence interval as "a to b" (a dash would read as
// a minus sign).
func interval(ci []float64) string {
	if len(ci) != 2 {
		return ""
	}
	return Num(ci[0], 2) + " to " + Num(ci[1], 2)
}

// pText formats a p-value: "p < 0.001" below a thousandth, else three
// decimals; rel is the relation the authors printed (=, <, >).
func pText(p *float64, rel string) string {
	if p == nil {
		return ""
	}
	if rel == "" || rel == "=" {
		if *p < 0.001 {
			return "p < 0.001"
		}
		rel = "="
	}
	return "p " + rel + " " + Num(*p, 3)
}

// bandWords is a band as words ("high concern").
func bandWords(band string) string { return Words(band) }

// minusBeforeDigit finds an ASCII hyphen used as a minus sign: at the
// start or after a space or bracket, before a digit or a decimal point.
var minusBeforeDigit = regexp.MustCompile(`(^|[\s(\[=])-([0-9.])`)

// Prose is a sentence of a report with every minus sign as U+2212.
func Prose(s string) string { return minusBeforeDigit.ReplaceAllString(s, "${1}"+Minus+"${2}") }

// arrow names an arc in words.
func arrow(a [2]string) string { return a[0] + " → " + a[1] }
