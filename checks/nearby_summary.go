package checks

import (
	"fmt"
	"math"
	"strings"
)

// nearbyFailSummary is the nearby-graphs summary of a failure.
const nearbyFailSummary = "A headline claim changes sign or significance in a graph one edit from the declared one " +
	"that fits the data about as well (|ΔBIC| < 2) and that the paper does not state as an alternative; the data " +
	"do not decide between the two graphs, so they do not decide the claim."

func nearbySummary(status string, run *nearbyRun, fs []Finding) string {
	switch status {
	case StatusFail:
		return nearbyFailSummary
	case StatusWarn:
		return nearbyWarnText(run, fs)
	}
	n := len(run.nb.Classes)
	if run.nb.DAGs == 0 {
		return "The background knowledge leaves no graph one edit from the declared one."
	}
	if run.near == 0 {
		return noneNearSummary(n) + betterText(run) + "."
	}
	held := "no claim changes sign or significance in " + them(run.near)
	if changedNear(run) {
		held = "a claim that changes in " + them(run.near) +
			" already changes among the declared graph's own equivalent graphs (see the equivalence check)"
	}
	return fmt.Sprintf("%s of graphs %s one edit from the declared graph; %d %s within ΔBIC 2 of it, and %s%s.",
		count(n, "class", "classes"), plural(n, "lies", "lie"), run.near, plural(run.near, "fits", "fit"), held,
		betterText(run))
}

func noneNearSummary(n int) string {
	if n == 1 {
		return "The one class of graphs one edit from the declared graph does not fit within ΔBIC 2 of it"
	}
	return fmt.Sprintf("None of the %d classes of graphs one edit from the declared graph fits within ΔBIC 2 of it", n)
}

// betterText says where the claims were re-estimated among the classes
// fitting better by 2 or more: the maxBetterListed best, and the search's
// end point.
func betterText(run *nearbyRun) string {
	if run.better == 0 {
		return ""
	}
	where := "each of them"
	switch left := run.better - run.examinedBetter; {
	case left > 0 && run.examinedBetter == 0:
		where = "none of them but where the greedy search ends"
	case left > 0:
		where = fmt.Sprintf("the %d that fit best and where the greedy search ends, not in the other %d",
			run.examinedBetter, left)
	}
	return fmt.Sprintf("; %s better by 2 or more, and the claims are re-estimated in %s (see the findings)",
		count(run.better, "class fits", "classes fit"), where)
}

// nearbyWarnText names the reasons for a warning that apply, and only
// those: claims that change in a class within 2 or in one fitting better
// by 2 or more (by the delta_bic of their findings), a search ending
// clearly better, close or better classes not re-estimated.
func nearbyWarnText(run *nearbyRun, fs []Finding) string {
	var near, better bool
	for _, f := range fs {
		if d, ok := f.Details["delta_bic"].(float64); ok && f.Claim != "" && f.Severity == StatusWarn {
			near, better = near || math.Abs(d) < weakBIC, better || d <= -weakBIC
		}
	}
	var why []string
	if near {
		why = append(why, "a claim changes sign or significance in a graph that fits about as well (|ΔBIC| < 2)")
	}
	if better {
		why = append(why, "a claim changes sign or significance in a graph that fits better by 2 or more")
	}
	if run.sr.Steps > 0 && run.sr.DeltaBIC < clearlyBetterBIC {
		why = append(why, fmt.Sprintf("a greedy search finds graphs that fit clearly better (ΔBIC = %s)",
			bicText(run.sr.DeltaBIC)))
	}
	if left := run.near - run.examined; left > 0 {
		why = append(why, fmt.Sprintf("%s within ΔBIC 2 were not re-estimated", count(left, "class", "classes")))
	}
	if left := run.better - run.examinedBetter; left > 0 {
		why = append(why, fmt.Sprintf("%s better by 2 or more were not re-estimated",
			count(left, "class", "classes")))
	}
	if t := run.unlisted(); len(t.claims) > 0 {
		why = append(why, fmt.Sprintf("%s could not be re-estimated in some classes (too many parent sets to list)",
			count(len(t.claims), "claim", "claims")))
	}
	if len(why) == 0 {
		return "The graphs near the declared one need a look; see the findings."
	}
	return "The graphs near the declared one need a look: " + strings.Join(why, "; ") + "; see the findings."
}

// changedNear reports whether a claim changes sign or significance in a
// class within ΔBIC 2 (then only among the declared graph's equivalents,
// or the status would not be pass).
func changedNear(run *nearbyRun) bool {
	for _, c := range run.listed {
		if math.Abs(c.delta) >= weakBIC {
			continue
		}
		for _, ae := range c.claims {
			if ae.Unstable {
				return true
			}
		}
	}
	return false
}
