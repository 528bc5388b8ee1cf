package checks

import (
	"math/big"
	"testing"
)

func TestExactCount(t *testing.T) {
	small, l := exactCount(big.NewInt(24))
	if small != int64(24) || l == nil || *l != 1.380211 {
		t.Fatalf("24: %v, %v", small, *l)
	}
	huge := new(big.Int).Exp(big.NewInt(120), big.NewInt(20), nil)
	v, l := exactCount(huge)
	if v != huge.String() || *l != 41.583625 { // 20·log10(120) = 41.5836249...
		t.Fatalf("120^20: %v, %v", v, *l)
	}
	edge := new(big.Int).Lsh(big.NewInt(1), 53)
	if v, _ := exactCount(edge); v != "9007199254740992" {
		t.Fatalf("2^53 should be a string, got %v", v)
	}
	if v, l := exactCount(new(big.Int)); v != int64(0) || l != nil {
		t.Fatalf("0: %v, %v", v, l)
	}
	if num(0.5) != 0.5 || num(nan()) != nil {
		t.Fatal("num")
	}
}

func nan() float64 { var z float64; return z / z }
