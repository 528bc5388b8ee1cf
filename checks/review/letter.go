package review

import (
	"regexp"
	"slices"
	"strings"
	"time"

	"github.com/pathvet/pathvet/checks"
)

// Letter is what the authors are sent (the asked items) and what the
// editor keeps (the noted ones), from one report and the decisions in
// force on it. It holds no score and no band: those are for triage.
type Letter struct {
	Title, ManuscriptID string
	PackageSHA256       string
	ToolVersion         string
	Screened            time.Time
	Caution             string
	Items               []Item // asked of the authors, numbered from 1
	Notes               []Item // for the editor only
}

// Item is one point of the letter: the findings that ask one question,
// the claims they are about, and the question.
type Item struct {
	N        int
	Claims   []ClaimRef
	Findings []string // the findings' sentences, as the report has them
	Question string   // "" for a note without one
	Severity string   // the worst of the findings'
	Keys     []string // the findings' keys
	Edited   bool     // the reviewer reworded the question
}

// ClaimRef is a claim as a letter names it: its id and its text.
type ClaimRef struct {
	ID, Text string
	Headline bool
}

// Compose builds the letter of a report under the decisions in force.
func Compose(r *checks.Report, decided []Decided) Letter {
	l := Letter{Title: r.Title, ManuscriptID: r.ManuscriptID, PackageSHA256: r.PackageSHA256,
		ToolVersion: r.ToolVersion, Screened: r.GeneratedAt, Caution: r.Caution}
	var ask, note []Decided
	for _, d := range decided {
		switch d.Decision {
		case Ask:
			ask = append(ask, d)
		case Note:
			note = append(note, d)
		}
	}
	l.Items, l.Notes = group(r, ask), group(r, note)
	for i := range l.Items {
		l.Items[i].N = i + 1
	}
	return l
}

// group makes one item of the findings that ask the same question of the
// same kind (check and topic kind), and orders the items: those about a
// headline claim first, then by severity, then in report order.
func group(r *checks.Report, ds []Decided) []Item {
	claims := claimRefs(r)
	var items []Item
	at := map[string]int{}
	for _, d := range ds {
		k := d.Check + "/" + checks.TopicKind(d.Topic) + "/" + d.Question
		i, ok := at[k]
		if !ok {
			i, at[k] = len(items), len(items)
			items = append(items, Item{Question: d.Question})
		}
		it := &items[i]
		it.Findings, it.Keys = append(it.Findings, d.Message), append(it.Keys, d.Key)
		it.Edited = it.Edited || d.Edited()
		if rank(d.Severity) > rank(it.Severity) {
			it.Severity = d.Severity
		}
		it.Claims = addClaims(it.Claims, claims, d)
	}
	for i := range items {
		items[i].Claims = inReportOrder(items[i].Claims, r)
		if len(items[i].Claims) > 1 && !items[i].Edited {
			items[i].Question = pluralQuestion(items[i].Question)
		}
	}
	slices.SortStableFunc(items, func(a, b Item) int { return order(b) - order(a) })
	return items
}

// order ranks an item: a headline claim first, then its severity.
func order(it Item) int {
	n := rank(it.Severity)
	if slices.ContainsFunc(it.Claims, func(c ClaimRef) bool { return c.Headline }) {
		n += 10
	}
	return n
}

func rank(severity string) int {
	return map[string]int{checks.StatusFail: 3, checks.StatusWarn: 2, checks.SeverityInfo: 1}[severity]
}

func claimRefs(r *checks.Report) map[string]ClaimRef {
	out := map[string]ClaimRef{}
	for _, c := range r.Claims {
		out[c.ID] = ClaimRef{ID: c.ID, Text: c.Text, Headline: c.Headline}
	}
	return out
}

// addClaims adds the finding's claim, and the claims its sentence names
// (a finding about no claim may name some: "the pooled estimate of C1"),
// to an item's claims.
func addClaims(have []ClaimRef, claims map[string]ClaimRef, d Decided) []ClaimRef {
	ids := mentioned(d.Message, claims)
	if d.Claim != "" {
		ids = append([]string{d.Claim}, ids...)
	}
	for _, id := range ids {
		c, ok := claims[id]
		if ok && !slices.ContainsFunc(have, func(h ClaimRef) bool { return h.ID == id }) {
			have = append(have, c)
		}
	}
	return have
}

// mentioned finds the ids of claims a sentence names; only ids with both
// a letter and a digit (C1, H2) are looked for, so that a number or a word
// in the sentence is never taken for a claim.
func mentioned(s string, claims map[string]ClaimRef) []string {
	var out []string
	for id := range claims {
		if !idLike.MatchString(id) {
			continue
		}
		if regexp.MustCompile(`(^|[^A-Za-z0-9_.-])` + regexp.QuoteMeta(id) + `($|[^A-Za-z0-9_-])`).MatchString(s) {
			out = append(out, id)
		}
	}
	slices.Sort(out)
	return out
}

var idLike = regexp.MustCompile(`^(?:.*[A-Za-z].*[0-9]|.*[0-9].*[A-Za-z]).*$`)

func inReportOrder(cs []ClaimRef, r *checks.Report) []ClaimRef {
	pos := map[string]int{}
	for i, c := range r.Claims {
		pos[c.ID] = i
	}
	slices.SortStableFunc(cs, func(a, b ClaimRef) int { return pos[a.ID] - pos[b.ID] })
	return cs
}

// plurals turn a default question asked of one claim ("this claim") into
// the same question asked of several; "each" keeps the verbs singular.
var plurals = strings.NewReplacer(
	"This claim's", "Each claim's", "this claim's", "each claim's",
	"This claim", "Each of these claims", "this claim", "each of these claims",
	"this estimate", "each of these estimates", "this association", "each of these associations",
)

func pluralQuestion(q string) string { return plurals.Replace(q) }
