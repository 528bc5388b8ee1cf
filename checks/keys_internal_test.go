package checks

import "testing"

// identify keeps a check's own question for a fail or warn finding, gives
// the table's to one without, and takes any question off an info finding
// (a check may word one for a finding whose severity it lowers).
func TestIdentify_QuestionsOnlyForFailAndWarn(t *testing.T) {
	fs := []Finding{
		{Severity: StatusWarn, Claim: "C1", Topic: "under.alt", Question: "Own?"},
		{Severity: SeverityInfo, Claim: "C2", Topic: "under.alt", Question: "Own?"},
		{Severity: StatusFail, Topic: "none-stated"},
	}
	(&Analysis{}).identify("alternatives", fs)
	if fs[0].Question != "Own?" || fs[1].Question != "" || fs[2].Question != questions["alternatives/none-stated"] {
		t.Errorf("questions %q, %q, %q", fs[0].Question, fs[1].Question, fs[2].Question)
	}
	if fs[0].Key != "alternatives:C1:under.alt" || fs[2].Key != "alternatives:none-stated" {
		t.Errorf("keys %s, %s", fs[0].Key, fs[2].Key)
	}
}
