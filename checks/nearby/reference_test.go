package nearby_test

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/pathvet/pathvet/checks/nearby"
)

// Against statsmodels (testdata/reference/nearby/make_reference.py): the
// likelihood-ratio statistic LR = N ln(RSS₀/RSS₁) of the nested OLS
// regressions behind each removed and added arrow. pathvet's T is
// (N − 1) F_ML, so removing an arrow changes BIC by (N − 1)/N · LR − ln N
// and adding one by −(N − 1)/N · LR + ln N.
func TestNeighbours_AgainstStatsmodels(t *testing.T) {
	const dir = "../../testdata/reference/nearby/"
	var ref struct {
		N       int
		Parents [][]int
		Edits   []struct {
			Op       nearby.Op
			From, To int
			LR       float64
		}
	}
	b, err := os.ReadFile(dir + "reference.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	s := readCorrelation(t, dir+"data.csv")
	m := nearby.Model{S: s, N: ref.N}
	nb, err := nearby.Neighbours(context.Background(), m, ref.Parents, nearby.Knowledge{})
	if err != nil {
		t.Fatal(err)
	}
	got := map[nearby.Edit]float64{}
	for _, c := range nb.Classes {
		for _, e := range c.Edits {
			got[e] = c.DeltaBIC
		}
	}
	n := float64(ref.N)
	for _, e := range ref.Edits {
		var want float64
		if e.Op == nearby.Remove {
			want = (n-1)/n*e.LR - math.Log(n)
		} else {
			want = -(n-1)/n*e.LR + math.Log(n)
		}
		d, ok := got[nearby.Edit{Op: e.Op, From: e.From, To: e.To}]
		if !ok || !scalar.EqualWithinAbsOrRel(d, want, 1e-8, 1e-8) {
			t.Errorf("%s %d→%d: ΔBIC %g (found %v), statsmodels %g", e.Op, e.From, e.To, d, ok, want)
		}
	}
	if len(ref.Edits) < 10 {
		t.Fatalf("only %d reference edits", len(ref.Edits))
	}
}

func readCorrelation(t *testing.T, path string) *mat.SymDense {
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	x := mat.NewDense(len(recs), len(recs[0]), nil)
	for i, rec := range recs {
		for j, cell := range rec {
			v, err := strconv.ParseFloat(cell, 64)
			if err != nil {
				t.Fatal(err)
			}
			x.Set(i, j, v)
		}
	}
	s := mat.NewSymDense(len(recs[0]), nil)
	stat.CorrelationMatrix(s, x, nil)
	return s
}
