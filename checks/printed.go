package checks

import (
	"encoding/json"
	"math"
	"strconv"
	"strings"
)

// printed holds a claim's numbers as the package prints them, so that a
// check can tell how much rounding they carry.
type printed struct {
	Estimate json.Number   `json:"estimate"`
	StdError json.Number   `json:"std_error"`
	CI       []json.Number `json:"ci"`
	PValue   json.Number   `json:"p_value"`
}

// printedClaims re-reads the claims' numbers from the source document.
func (s *Study) printedClaims() []printed {
	var doc struct {
		Claims []printed `json:"claims"`
	}
	if err := json.Unmarshal(s.Source, &doc); err != nil || len(doc.Claims) != len(s.Package.Claims) {
		return make([]printed, len(s.Package.Claims))
	}
	return doc.Claims
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
