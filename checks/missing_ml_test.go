package checks_test

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// mlReference is testdata/reference/mlse/ml_se.json, from the R SEM
// reference (testdata/reference/mlse/ml_se.R, Debian's R SEM package):
// full-information ML with missing = "ml" and observed information.
type mlReference struct {
	Cases []struct {
		Name, Data, Outcome, Focal, Scale string
		Adjust                            []string
		Estimate                          float64
		StdError                          float64 `json:"std_error"`
	}
}

// mlPackage is a package over the reference CSV file (airquality's
// columns renamed as the reference script names them), every column a
// continuous variable, the given claims, complete cases declared.
func mlPackage(t *testing.T, file string, claims []string) *checks.Study {
	t.Helper()
	b, err := os.ReadFile("../testdata/reference/mlse/" + file)
	if err != nil {
		t.Fatal(err)
	}
	csv := strings.ReplaceAll(string(b), `"`, "")
	if strings.HasSuffix(file, "airquality.csv") {
		csv = "ozone,solar_r,wind,temp,month,day" + csv[strings.IndexByte(csv, '\n'):]
	}
	header := strings.Split(strings.TrimSpace(csv[:strings.IndexByte(csv, '\n')]), ",")
	var vars []string
	for _, h := range header {
		vars = append(vars, fmt.Sprintf(`{"name": %q, "scale": "continuous"}`, h))
	}
	doc := fmt.Sprintf(`{"format_version": 1, "title": "t", "design": "observational", "variables": [%s],
		"claims": [%s], "missing_data": {"method": "complete_cases"}, "data": {"kind": "rows", "csv": %q}}`,
		strings.Join(vars, ", "), strings.Join(claims, ", "), csv)
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// Each claim's maximum-likelihood estimate under missing data, its SE
// from the observed information of the saturated normal model by the
// delta method, against the R SEM reference (testdata/reference/mlse,
// Debian's R SEM package, missing = "ml", observed information): mtcars
// with only the outcome missing, airquality's six columns with Ozone and
// Solar.R missing. Tolerance 1e-6 relative for estimates and SEs (seen:
// 1.2e-7 at worst; EM and the reference's optimizer stop at their own
// tolerances). The p-value and interval are normal-theory, from that SE.
func TestMissingData_MLStandardErrors_Reference(t *testing.T) {
	b, err := os.ReadFile("../testdata/reference/mlse/ml_se.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref mlReference
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Cases) == 0 {
		t.Fatalf("reference: %v", err)
	}
	byFile := map[string][]string{}
	for i, c := range ref.Cases {
		adj, _ := json.Marshal(c.Adjust)
		byFile[c.Data] = append(byFile[c.Data], fmt.Sprintf(`{"id": "R%d", "text": "t", "kind": "association",
			"from": %q, "to": %q, "adjust_for": %s, "estimate_scale": %q, "estimate": 0.1, "p_value": 0.5}`,
			i, c.Focal, c.Outcome, adj, c.Scale))
	}
	reports := map[string]*checks.Report{}
	for file, claims := range byFile {
		reports[file] = mustRun(t, mlPackage(t, file, claims))
	}
	for i, c := range ref.Cases {
		ml := claimByID(reports[c.Data], fmt.Sprintf("R%d", i)).MissingData["maximum_likelihood"]
		if ml == nil || ml.Estimate == nil || ml.StdError == nil || ml.PValue == nil || len(ml.CI) != 2 {
			t.Fatalf("%s, %s on %s (%s): ML estimate %+v", c.Name, c.Outcome, c.Focal, c.Scale, ml)
		}
		if !scalar.EqualWithinAbsOrRel(*ml.Estimate, c.Estimate, 1e-12, 1e-6) ||
			!scalar.EqualWithinAbsOrRel(*ml.StdError, c.StdError, 1e-12, 1e-6) {
			t.Errorf("%s, %s on %s (%s): %.8g (SE %.8g), reference %.8g (SE %.8g)", c.Name, c.Outcome, c.Focal,
				c.Scale, *ml.Estimate, *ml.StdError, c.Estimate, c.StdError)
		}
		z := c.Estimate / c.StdError // the normal reference, as the reference prints its p
		if c.Scale == "correlation" {
			z = math.Atanh(c.Estimate) * (1 - c.Estimate*c.Estimate) / c.StdError // on Fisher's z scale
		}
		if p := math.Erfc(math.Abs(z) / math.Sqrt2); ml.Distribution != "normal" ||
			!scalar.EqualWithinAbsOrRel(*ml.PValue, p, 1e-12, 1e-5) {
			t.Errorf("%s, %s on %s (%s): p %v under %q, want %v under the normal", c.Name, c.Outcome, c.Focal,
				c.Scale, *ml.PValue, ml.Distribution, p)
		}
	}
}

func claimByID(r *checks.Report, id string) checks.ClaimReport {
	for _, c := range r.Claims {
		if c.ID == id {
			return c
		}
	}
	return checks.ClaimReport{}
}

// Past the information's bound (more than 40 variables) the ML estimates
// have no SE, say why, and the comparison that needs them says it could
// not be made, never using a complete-data SE.
func TestMissingData_MLStandardErrors_TooWide(t *testing.T) {
	r := rand.New(rand.NewPCG(41, 1))
	const p, n = 42, 120
	var vars, head []string
	for j := range p {
		vars = append(vars, fmt.Sprintf(`{"name": "v%d", "scale": "continuous"}`, j))
		head = append(head, fmt.Sprintf("v%d", j))
	}
	var b strings.Builder
	b.WriteString(strings.Join(head, ",") + "\n")
	for i := range n {
		f := r.NormFloat64()
		cells := make([]string, p)
		for j := range p {
			cells[j] = fmt.Sprintf("%.4f", 0.5*f+r.NormFloat64())
		}
		if i%5 == 0 {
			cells[1] = ""
		}
		b.WriteString(strings.Join(cells, ",") + "\n")
	}
	doc := fmt.Sprintf(`{"format_version": 1, "title": "t", "design": "observational", "variables": [%s],
		"claims": [{"id": "C1", "text": "v0 goes with v1", "kind": "association", "from": "v0", "to": "v1",
		"estimate": 0.2, "p_value": 0.01}], "missing_data": {"method": "multiple_imputation"},
		"data": {"kind": "rows", "csv": %q}}`, strings.Join(vars, ", "), b.String())
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	rep := mustRun(t, s)
	ml := rep.Claims[0].MissingData["maximum_likelihood"]
	if ml == nil || ml.StdError != nil || ml.PValue != nil ||
		ml.Error != "no standard error: the observed information is too large to compute: 42 variables, past 40" {
		t.Fatalf("ML estimate %+v", ml)
	}
	found := false
	for _, f := range checkOf(rep, "missing-data").Findings {
		found = found || f.Claim == "C1" && strings.Contains(f.Message, "could not be estimated by maximum likelihood")
	}
	if !found {
		t.Errorf("findings %+v", checkOf(rep, "missing-data").Findings)
	}
}

// The audit's case: a package that handles missing data by multiple
// imputation, whose headline claim is not significant by it (p ≈ .07), is
// not failed by a maximum-likelihood comparison whose SE treats the EM
// moments as complete rows: x is missing in about half the rows (more
// where z is high), so the complete-data SE on 200 rows is far too small;
// the observed-information SE (TestMissingData_MLStandardErrors_Reference)
// agrees with multiple imputation that the claim is not significant.
func TestMissingData_MLAgreesWithImputationOnHeavyMissingness(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 17))
	var b strings.Builder
	b.WriteString("x,y,z\n")
	for range 200 {
		z := r.NormFloat64()
		x := 0.6*z + 0.8*r.NormFloat64()
		y := 0.12*x + 0.5*z + r.NormFloat64()
		cell := fmt.Sprintf("%.4f", x)
		if share := 0.25 + 0.5*math.Max(math.Copysign(1, z), 0); r.Float64() < share {
			cell = ""
		}
		fmt.Fprintf(&b, "%s,%.4f,%.4f\n", cell, y, z)
	}
	doc := fmt.Sprintf(`{"format_version": 1, "title": "t", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "continuous"},
		{"name": "z", "scale": "continuous"}],
		"graph": {"edges": [{"from": "z", "to": "x"}, {"from": "x", "to": "y"}, {"from": "z", "to": "y"}],
		"fixed_edges": [{"from": "x", "to": "y"}]},
		"claims": [{"id": "H1", "text": "x goes with y", "kind": "direct_effect", "from": "x", "to": "y",
		"headline": true, "estimate": 0.1, "p_value": 0.1}], "missing_data": {"method": "multiple_imputation"},
		"data": {"kind": "rows", "csv": %q}}`, b.String())
	s, err := load.Load([]byte(doc), load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	rep := mustRun(t, s)
	md, c := rep.Claims[0].MissingData, checkOf(rep, "missing-data")
	mi, ml := *md["multiple_imputation"].PValue, *md["maximum_likelihood"].PValue
	if c.Status == checks.StatusFail || mi < 0.05 || ml < 0.05 || math.Abs(ml-mi) > 0.03 {
		t.Errorf("missing-data %s: MI p %.3f, ML p %.3f (SE %v)", c.Status, mi, ml, *md["maximum_likelihood"].StdError)
	}
}
