package checks

import (
	"encoding/json"
	"math"
	"strconv"
	"strings"
)

// Printed holds a claim's numbers as the package prints them, so that a
// check can tell how much rounding they carry.
type Printed struct {
	Estimate json.Number   `json:"estimate"`
	StdError json.Number   `json:"std_error"`
	CI       []json.Number `json:"ci"`
	PValue   json.Number   `json:"p_value"`
}

type printed = Printed

// printedClaims returns the claims' printed numbers, none where the
// study does not have them.
func (s *Study) printedClaims() []Printed {
	if len(s.Printed) != len(s.Package.Claims) {
		return make([]Printed, len(s.Package.Claims))
	}
	return s.Printed
}

// halfUnit is half a unit in the last printed digit of a number: the most
// that rounding to its digits can have moved it. "0.041" gives 0.0005,
// "4e-4" gives 0.00005. An absent number gives 0.
func halfUnit(n json.Number) float64 {
	s := strings.ToLower(string(n))
	if s == "" {
		return 0
	}
	mant, exp := s, 0
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		mant = s[:i]
		exp, _ = strconv.Atoi(s[i+1:])
	}
	decimals := 0
	if i := strings.IndexByte(mant, '.'); i >= 0 {
		decimals = len(mant) - i - 1
	}
	return 0.5 * math.Pow(10, float64(exp-decimals))
}
