package load

import (
	"encoding/json"

	"github.com/pathvet/pathvet/checks"
)

// printedClaims reads the claims' numbers as the document prints them;
// nil when they cannot be read.
func printedClaims(doc []byte, claims int) []checks.Printed {
	var d struct {
		Claims []checks.Printed `json:"claims"`
	}
	if err := json.Unmarshal(doc, &d); err != nil || len(d.Claims) != claims {
		return nil
	}
	return d.Claims
}
