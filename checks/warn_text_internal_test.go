package checks

import (
	"testing"

	"github.com/pathvet/pathvet/checks/nearby"
)

// The measurement warning names the reasons that apply and no other.
func TestMeasurementWarnText(t *testing.T) {
	for _, tc := range []struct {
		m    map[string]any
		want string
	}{
		{map[string]any{"variables_without_reliability": 1, "claims_corrected": 3, "claims_changed": 0},
			"Measurement error needs attention: no reliability is reported for 1 of the claims' variables; " +
				"see the findings."},
		{map[string]any{"variables_without_reliability": 0, "claims_corrected": 3, "claims_changed": 2},
			"Measurement error needs attention: correcting for it changes the conclusion of 2 of the 3 claims " +
				"re-estimated; see the findings."},
		{map[string]any{"variables_without_reliability": 2, "claims_corrected": 0, "claims_changed": 0},
			"Measurement error needs attention: no reliabilities are reported for 2 of the claims' variables, and " +
				"no claim could be re-estimated on the corrected correlations; see the findings."},
		{map[string]any{"variables_without_reliability": 0, "claims_corrected": 2, "claims_changed": 0},
			"Measurement error needs attention: some claims could not be estimated with and without the " +
				"correction; see the findings."},
	} {
		if got := measurementWarnText(tc.m); got != tc.want {
			t.Errorf("%v:\n got %q\nwant %q", tc.m, got, tc.want)
		}
	}
}

// The nearby-graphs warning names each reason that applies, and only those.
func TestNearbyWarnText(t *testing.T) {
	near := Finding{Severity: StatusWarn, Claim: "C1", Details: map[string]any{"delta_bic": 0.5}}
	better := Finding{Severity: StatusWarn, Claim: "C1", Details: map[string]any{"delta_bic": -3.0}}
	covered := Finding{Severity: SeverityInfo, Claim: "C1", Details: map[string]any{"delta_bic": -3.0}}
	const head = "The graphs near the declared one need a look: "
	for _, tc := range []struct {
		run  *nearbyRun
		fs   []Finding
		want string
	}{
		{&nearbyRun{sr: &nearby.SearchResult{}}, []Finding{near, covered},
			head + "a claim changes sign or significance in a graph that fits about as well (|ΔBIC| < 2); see the " +
				"findings."},
		{&nearbyRun{sr: &nearby.SearchResult{Steps: 2, DeltaBIC: -4}}, []Finding{better},
			head + "a claim changes sign or significance in a graph that fits better by 2 or more; see the findings."},
		{&nearbyRun{sr: &nearby.SearchResult{Steps: 1, DeltaBIC: -7}, near: 22, examined: 20, better: 7,
			examinedBetter: 5}, nil,
			head + "a greedy search finds graphs that fit clearly better (ΔBIC = -7.00); 2 classes within ΔBIC 2 " +
				"were not re-estimated; 2 classes better by 2 or more were not re-estimated; see the findings."},
	} {
		if got := nearbyWarnText(tc.run, tc.fs); got != tc.want {
			t.Errorf("got  %q\nwant %q", got, tc.want)
		}
	}
}
