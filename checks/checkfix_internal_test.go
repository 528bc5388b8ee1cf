package checks

import "testing"

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
