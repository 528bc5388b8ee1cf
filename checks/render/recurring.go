package render

import (
	"sort"

	"github.com/pathvet/pathvet/checks"
)

// CheckTally counts how often one check failed or warned.
type CheckTally struct {
	ID, Title  string
	Fail, Warn int
	Of         int // reports that ran the check
}

// KindTally counts, for one kind of claim, how often its claims moved.
type KindTally struct {
	Kind   string
	Claims int
	// AcrossGraphs: sign or significance differs in some plausible
	// equivalent graph; UnderAlternative: under some stated alternative;
	// ByMissingData: under some way of handling missing data.
	AcrossGraphs, UnderAlternative, ByMissingData int
}

// Recurring is what recurs across a set of reports.
type Recurring struct {
	Reports int
	Checks  []CheckTally // most fails first, then most warnings
	Kinds   []KindTally  // by kind
}

// Tally counts the failing and warning checks and the unstable claims of
// the reports.
func Tally(reports []*checks.Report) Recurring {
	byCheck := map[string]*CheckTally{}
	byKind := map[string]*KindTally{}
	for _, r := range reports {
		tallyChecks(byCheck, r.Checks)
		for _, c := range r.Claims {
			k := byKind[c.Kind]
			if k == nil {
				k = &KindTally{Kind: Words(c.Kind)}
				byKind[c.Kind] = k
			}
			tallyClaim(k, c, r.SignificanceLevel)
		}
	}
	return sortTallies(len(reports), byCheck, byKind)
}

func tallyChecks(byCheck map[string]*CheckTally, cs []checks.CheckResult) {
	for _, c := range cs {
		t := byCheck[c.ID]
		if t == nil {
			t = &CheckTally{ID: c.ID, Title: c.Title}
			byCheck[c.ID] = t
		}
		t.Of++
		t.Fail += b2i(c.Status == checks.StatusFail)
		t.Warn += b2i(c.Status == checks.StatusWarn)
	}
}

// sortTallies orders the checks by how many reports they failed in, then
// by how many they warned in (a check that failed once ranks above one
// that only ever warned), then by id; the kinds by name.
func sortTallies(n int, byCheck map[string]*CheckTally, byKind map[string]*KindTally) Recurring {
	out := Recurring{Reports: n}
	for _, t := range byCheck {
		out.Checks = append(out.Checks, *t)
	}
	sort.Slice(out.Checks, func(i, j int) bool {
		a, b := out.Checks[i], out.Checks[j]
		switch {
		case a.Fail != b.Fail:
			return a.Fail > b.Fail
		case a.Warn != b.Warn:
			return a.Warn > b.Warn
		}
		return a.ID < b.ID
	})
	for _, k := range byKind {
		out.Kinds = append(out.Kinds, *k)
	}
	sort.Slice(out.Kinds, func(i, j int) bool { return out.Kinds[i].Kind < out.Kinds[j].Kind })
	return out
}

func tallyClaim(k *KindTally, c checks.ClaimReport, alpha float64) {
	k.Claims++
	if c.AcrossEquivalents != nil && c.AcrossEquivalents.Unstable {
		k.AcrossGraphs++
	}
	ref := fromEstimate(c.Declared)
	alt := false
	for _, a := range c.UnderAlternatives {
		alt = alt || altShift(ref, altPoint(a, ref), a, alpha) != ""
	}
	k.UnderAlternative += b2i(alt)
	md := false
	for _, e := range c.MissingData {
		md = md || shift(ref, fromEstimate(e), alpha) != ""
	}
	k.ByMissingData += b2i(md)
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}
