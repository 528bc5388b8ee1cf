package checks

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// The likely missing codes of the data (Dataset.Suspects with Code), the
// data with them read as missing, and the words for them.

// codePhrases are the pieces of a sentence about the likely codes.
type codePhrases struct {
	codes    string // -99 in column "income"
	theCodes string // the code, the codes
	declare  string // "-99" (the text to list)
	pronoun  string // it, them
	ifCodes  string // -99 is a missing code; these are missing codes
	measured string // a measurement, measurements
}

func codesPhrases(codes []Suspect) codePhrases {
	var where, texts []string
	for _, s := range codes {
		v := strconv.FormatFloat(s.Value, 'g', -1, 64)
		where = append(where, fmt.Sprintf("%s in column %q", v, s.Variable))
		if t := strconv.Quote(v); !slices.Contains(texts, t) {
			texts = append(texts, t)
		}
	}
	ph := codePhrases{codes: joinAnd(where), theCodes: "the code", declare: joinAnd(texts), pronoun: "it",
		ifCodes: strconv.FormatFloat(codes[0].Value, 'g', -1, 64) + " is a missing code", measured: "a measurement"}
	if len(codes) > 1 {
		ph.theCodes, ph.pronoun, ph.ifCodes, ph.measured = "the codes", "them", "these are missing codes",
			"measurements"
	}
	return ph
}

// joinAnd joins "a", "a and b", "a, b and c".
func joinAnd(xs []string) string {
	if len(xs) <= 1 {
		return strings.Join(xs, "")
	}
	return strings.Join(xs[:len(xs)-1], ", ") + " and " + xs[len(xs)-1]
}

// likelyCodes are the data's suspect values that look like missing codes.
func (a *Analysis) likelyCodes() []Suspect {
	d := a.Study.Data
	if d == nil || d.Kind == DataSummary {
		return nil
	}
	var out []Suspect
	for _, s := range d.Suspects {
		if s.Code {
			out = append(out, s)
		}
	}
	return out
}

// recodedMoments are the complete-case moments of the data with the
// likely codes read as missing, computed once.
func (a *Analysis) recodedMoments() (*Moments, error) {
	if a.recoded == nil && a.recodedErr == nil {
		d := a.Study.Data
		cols := make([][]float64, len(d.Columns))
		for j, col := range d.Columns {
			cols[j] = col
		}
		for _, s := range a.likelyCodes() {
			j := a.Study.Index[s.Variable]
			col := append([]float64(nil), cols[j]...)
			for r, v := range col {
				if v == s.Value {
					col[r] = math.NaN()
				}
			}
			cols[j] = col
		}
		a.recoded, a.recodedErr = rowMoments(completeCases(cols), methodCodesMissing)
	}
	return a.recoded, a.recodedErr
}

// methodCodesMissing names the moments of the data with the likely codes
// read as missing.
const methodCodesMissing = "codes_read_as_missing"

// recodedEstimate is claim i as declaredEstimate makes it, on the data with
// the likely codes read as missing.
func (a *Analysis) recodedEstimate(i int) est {
	c := a.Study.Package.Claims[i]
	m, err := a.recodedMoments()
	if err != nil {
		return est{err: err, scale: claimScale(c)}
	}
	e := a.estimateUnder(m, a.declaredParentsFor(c), c)
	if why := a.graphContradiction(c); why != "" && e.ok() {
		e = structuralZero(c, e.adjusted, why)
	}
	return e
}
