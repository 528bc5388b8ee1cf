package render

import "math"

// Scale maps data values linearly onto a pixel range.
type Scale struct {
	D0, D1 float64 // the data domain
	R0, R1 float64 // the pixel range
}

// At maps x onto the range.
func (s Scale) At(x float64) float64 {
	return s.R0 + (x-s.D0)/(s.D1-s.D0)*(s.R1-s.R0)
}

// NiceScale returns a scale whose domain covers every finite value and
// ref (the no-effect value), widened to a multiple of a "nice" step of
// 1, 2 or 5 times a power of ten, with its ticks: the loose labelling of
// Heckbert, "Nice numbers for graph labels", Graphics Gems (1990) 61–63.
// With no spread at all the domain is ref ± 1.
func NiceScale(values []float64, ref, r0, r1 float64, ticks int) (Scale, []float64) {
	lo, hi := ref, ref
	for _, v := range values {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi = min(lo, v), max(hi, v)
		}
	}
	if hi-lo == 0 {
		lo, hi = lo-1, hi+1
	}
	step := niceNum((hi-lo)/float64(max(ticks-1, 1)), true)
	lo, hi = math.Floor(lo/step)*step, math.Ceil(hi/step)*step
	var ts []float64
	for k := 0; lo+float64(k)*step <= hi+step/2; k++ {
		ts = append(ts, cleanZero(lo+float64(k)*step))
	}
	return Scale{D0: lo, D1: hi, R0: r0, R1: r1}, ts
}

// niceNum is Heckbert's nice number near x: 1, 2, 5 or 10 times a power
// of ten, rounded or else the next above.
func niceNum(x float64, round bool) float64 {
	e := math.Floor(math.Log10(x))
	f := x / math.Pow(10, e)
	var nf float64
	switch {
	case round && f < 1.5, !round && f <= 1:
		nf = 1
	case round && f < 3, !round && f <= 2:
		nf = 2
	case round && f < 7, !round && f <= 5:
		nf = 5
	default:
		nf = 10
	}
	return nf * math.Pow(10, e)
}

// cleanZero rounds away the floating-point dust of a tick (1e-17 for 0).
func cleanZero(x float64) float64 {
	r := math.Round(x*1e9) / 1e9
	if r == 0 {
		return 0
	}
	return r
}
