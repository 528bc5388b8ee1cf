package api

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
)

// Messages of the claim rows.
const (
	msgNotNumber = "%q is not a number; write it as the paper prints it, such as −0.29, -.29 or 0.29"
	msgBadP      = "%q is not a p-value; write 0.03, or \"< .001\" as the paper prints it"
	msgHalfCI    = "Give both ends of the interval, or neither."
)

// readClaims reads the claim rows into claims; an empty row is left out.
// A claim without an ID is numbered after its row (C1, C2, ...), as the
// form's placeholder shows.
func (b *built) readClaims(rows []claimRow, x *nameIndex) {
	b.pkg.Claims = []checks.Claim{}
	for i, r := range rows {
		if r.blank() {
			continue
		}
		n := i + 1
		c := checks.Claim{ID: strings.TrimSpace(r.ID), Text: strings.TrimSpace(r.Text), Kind: r.Kind,
			Headline: r.Headline}
		if c.ID == "" {
			c.ID = fmt.Sprintf("C%d", n)
		}
		c.From = b.claimEnd(n, "from", r.From, x)
		c.To = b.claimEnd(n, "to", r.To, x)
		c.Estimate = b.claimNumber(n, "estimate", r.Estimate)
		b.claimCI(n, r, &c)
		b.claimP(n, r.P, &c)
		b.pkg.Claims = append(b.pkg.Claims, c)
		b.claimRows = append(b.claimRows, n)
	}
}

// claimEnd resolves a claim's from or to; an empty one is left to the
// loader, which says it is required; one that names no variable is kept
// as written (the loader's own problem with it is not shown twice).
func (b *built) claimEnd(n int, field, text string, x *nameIndex) string {
	if strings.TrimSpace(text) == "" {
		return ""
	}
	name, msg := x.resolve(text)
	if msg != "" {
		b.errs.add(claimField(n, field), msg)
		return strings.TrimSpace(text)
	}
	return name
}

// claimNumber reads a figure of a claim row; nil when empty or not a
// number (which is reported).
func (b *built) claimNumber(n int, field, text string) *float64 {
	text = strings.TrimSpace(text)
	if text == "" {
		return nil
	}
	x, ok := formNumber(text)
	if !ok {
		b.errs.add(claimField(n, field), fmt.Sprintf(msgNotNumber, text))
		return nil
	}
	return &x
}

func (b *built) claimCI(n int, r claimRow, c *checks.Claim) {
	lo, hi := b.claimNumber(n, "ci_low", r.CILow), b.claimNumber(n, "ci_high", r.CIHigh)
	switch {
	case lo != nil && hi != nil:
		c.CI = []float64{*lo, *hi}
	case lo != nil && strings.TrimSpace(r.CIHigh) == "":
		b.errs.add(claimField(n, "ci_high"), msgHalfCI)
	case hi != nil && strings.TrimSpace(r.CILow) == "":
		b.errs.add(claimField(n, "ci_low"), msgHalfCI)
	}
}

// pRE is a p-value as papers print it: "p < .001", "< 0.001", ".03",
// "p = 0.03".
var pRE = regexp.MustCompile(`^(?i:p)?\s*([<>=])?\s*([^<>=\s]+)$`)

func (b *built) claimP(n int, text string, c *checks.Claim) {
	text = strings.TrimSpace(text)
	if text == "" {
		return
	}
	m := pRE.FindStringSubmatch(text)
	if m == nil {
		b.errs.add(claimField(n, "p"), fmt.Sprintf(msgBadP, text))
		return
	}
	p, ok := formNumber(m[2])
	if !ok {
		b.errs.add(claimField(n, "p"), fmt.Sprintf(msgBadP, text))
		return
	}
	c.PValue = &p
	if m[1] == "<" || m[1] == ">" {
		c.PRelation = m[1]
	}
}

// formNumber reads a number as people type it: a leading dot (.29), the
// Unicode minus sign (U+2212) or an en dash for minus, a decimal comma
// when there is no point (0,29).
func formNumber(s string) (float64, bool) {
	s = strings.NewReplacer("\u2212", "-", "\u2013", "-").Replace(strings.TrimSpace(s))
	if !strings.Contains(s, ".") && strings.Count(s, ",") == 1 {
		s = strings.Replace(s, ",", ".", 1)
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || strings.ContainsAny(s, "xXpPiInN_") {
		return 0, false
	}
	return x, true
}

// claimField is the id of a claim row's field: "c2-from".
func claimField(n int, field string) string { return fmt.Sprintf("c%d-%s", n, field) }
