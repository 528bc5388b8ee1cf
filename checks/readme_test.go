package checks_test

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// The README's score table states each check's deductions; it must match
// checks.Weights.
func TestREADME_ScoreTable(t *testing.T) {
	b, err := os.ReadFile("../README.md")
	if err != nil {
		t.Fatal(err)
	}
	for id, w := range checks.Weights {
		row := fmt.Sprintf("| `%s` | %d | %d | %d |", id, w.Warn, w.Fail, w.HeadlineFail)
		if !strings.Contains(string(b), row) {
			t.Errorf("README lacks the row %q", row)
		}
	}
}
