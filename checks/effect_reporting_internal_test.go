package checks

import (
	"encoding/json"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks/effects"
)

// reportedClaim is a claim with its numbers and their printed digits.
func reportedClaim(est, se string, ci []string, p, rel string) (Claim, printed) {
	c := Claim{ID: "R", EstimateScale: "standardized", PRelation: rel}
	pr := printed{Estimate: json.Number(est), StdError: json.Number(se), PValue: json.Number(p)}
	num := func(s string) *float64 {
		if s == "" {
			return nil
		}
		v, _ := json.Number(s).Float64()
		return &v
	}
	c.Estimate, c.StdError, c.PValue = num(est), num(se), num(p)
	for _, s := range ci {
		c.CI = append(c.CI, *num(s))
		pr.CI = append(pr.CI, json.Number(s))
	}
	return c, pr
}

// Each case is one that a mutation of the consistency rule gets wrong:
// no rounding allowance (case 1 flagged; case 8 for the printed p alone), the normal instead of t on the
// fit's df (cases 3–5), an SE taken from the interval under the normal
// and the p under t (case 5), a "p <" read as "p =" (case 6) or as
// always true (case 7).
func TestEffectReporting_ConsistencyRules(t *testing.T) {
	ols := func(df float64) est { return est{method: MethodOLS, df: df, n: int(df) + 2, scale: "standardized"} }
	for i, c := range []struct {
		est, se string
		ci      []string
		p, rel  string
		decl    est
		flagged bool
	}{
		// .2/.1: z = 2, p = .046; printed to one digit, z lies anywhere in [1, 5].
		{"0.2", "0.1", nil, "0.03", "", est{}, false},
		{"0.200", "0.100", nil, "0.03", "", est{}, true}, // z in [1.985, 2.015]: p in [.044, .047]
		// .50/.20 on t(10): p in [.027, .037]; under the normal [.0096, .016].
		{"0.50", "0.20", nil, "0.031", "", ols(10), false},
		{"0.50", "0.20", nil, "0.012", "", ols(10), true},
		// A t(5) interval .05 to .95 gives SE .175 and p = .036; the normal
		// quantile gives SE .23 and p = .029 (normal) or .081 (t).
		{"0.50", "", []string{"0.05", "0.95"}, "0.036", "", ols(5), false},
		{"0.5", "0.05", nil, "0.001", "<", est{}, false}, // z = 10
		{"0.10", "0.10", nil, "0.05", "<", est{}, true},  // z ≤ 1.11: p ≥ .27
		// .2000/.1000: z in [1.9989, 2.0011], p in [.04540, .04562] (2Φ(−z));
		// the printed p "0.05" stands for [.045, .055], which meets it: only
		// the p-value's own rounding makes it consistent.
		{"0.2000", "0.1000", nil, "0.05", "", est{}, false},
		{"0.2000", "0.1000", nil, "0.050", "", est{}, true}, // [.0495, .0505] does not
	} {
		cl, pr := reportedClaim(c.est, c.se, c.ci, c.p, c.rel)
		f := (&Analysis{}).consistency(cl, pr, c.decl)
		if (f != nil) != c.flagged {
			msg := "not flagged"
			if f != nil {
				msg = f.Message
			}
			t.Errorf(
				"case %d (%s, %s, %v, p %s %s): want flagged %v, got %s",
				i+1,
				c.est,
				c.se,
				c.ci,
				c.rel,
				c.p,
				c.flagged,
				msg,
			)
		}
		if f != nil && !strings.Contains(f.Message, distName(testDF(cl, c.decl))) {
			t.Errorf("case %d: the message does not name the distribution: %s", i+1, f.Message)
		}
	}
}

// The test distribution: t on the OLS fit's residual df, the normal for
// odds ratios, correlations and estimates the data did not give by OLS.
func TestEffectReporting_TestDF(t *testing.T) {
	ols := est{method: MethodOLS, df: 97}
	for _, c := range []struct {
		scale string
		decl  est
		want  float64
	}{
		{"standardized", ols, 97}, {"unstandardized", ols, 97}, {"odds_ratio", ols, effects.Normal},
		{"correlation", ols, effects.Normal}, {"standardized", est{method: MethodPartial}, effects.Normal},
		{"standardized", est{method: MethodOLS, df: 97, err: errTest}, effects.Normal},
	} {
		if got := testDF(Claim{EstimateScale: c.scale}, c.decl); got != c.want {
			t.Errorf("%s, %s: df %v, want %v", c.scale, c.decl.method, got, c.want)
		}
	}
	if distName(97) != "t(97)" || distName(effects.Normal) != "normal" {
		t.Errorf("names %q %q", distName(97), distName(effects.Normal))
	}
}

var errTest = errFixed("no fit")

type errFixed string

func (e errFixed) Error() string { return string(e) }

// A reported estimate outside the recomputed interval is flagged; one
// inside is not.
func TestEffectReporting_OutsideRecomputedInterval(t *testing.T) {
	decl := est{value: 0.3, lo: 0.2, hi: 0.4, p: 1e-6, method: MethodOLS, scale: "standardized"}
	for _, c := range []struct {
		estimate float64
		flagged  bool
	}{{0.35, false}, {0.6, true}, {-0.3, true}} {
		cl := Claim{ID: "R", Estimate: &c.estimate, EstimateScale: "standardized"}
		if fs := (&Analysis{Study: &Study{}}).reportedFinding(0, cl, decl); (len(fs) > 0) != c.flagged {
			t.Errorf("estimate %v: findings %v, want flagged %v", c.estimate, fs, c.flagged)
		}
	}
}
