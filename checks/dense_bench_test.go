package checks_test

import (
	"context"
	"os"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// BenchmarkDensePackage screens the package named by PATHVET_DENSE_PACKAGE
// (testdata/bench/dense.py writes one: a complete DAG on 100 variables,
// 200 claims), every check, loading included.
func BenchmarkDensePackage(b *testing.B) {
	path := os.Getenv("PATHVET_DENSE_PACKAGE")
	if path == "" {
		b.Skip("PATHVET_DENSE_PACKAGE is not set (testdata/bench/dense.py DIR writes DIR/package.json)")
	}
	doc, err := os.ReadFile(path)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		s, err := load.Load(doc, load.Options{})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := checks.Run(context.Background(), s, checks.Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
