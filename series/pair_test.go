package series

import (
	"math"
	"testing"

	"pgregory.net/rapid"
)

func TestBestPairExample(t *testing.T) {
	// 12.34 kΩ from E24: 12k + 330 = 12.33k (error -0.08 %) is the best
	// series pair by inspection of the E24 table.
	p, e, err := E24.BestPair(12.34e3)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(e) > 1e-3 {
		t.Errorf("pair %v error %v, want within 0.1 %%", p, e)
	}
}

// TestBestPairProperties: a pair is never farther than the nearest single
// value (a value plus a part a thousand times smaller is in the search).
func TestBestPairProperties(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := rapid.SampledFrom([]Series{E6, E12, E24, E96}).Draw(t, "series")
		x := math.Pow(10, rapid.Float64Range(0, 7).Draw(t, "log10"))
		p, e, err := s.BestPair(x)
		if err != nil {
			t.Fatal(err)
		}
		if !isMember(s, p.A) || !isMember(s, p.B) {
			t.Fatalf("pair %v not of %v", p, s)
		}
		if got := p.Value()/x - 1; got != e {
			t.Fatalf("reported error %v, value gives %v", e, got)
		}
		single := math.Abs(math.Log(s.Nearest(x) / x))
		if math.Abs(math.Log1p(e)) > single+1e-12 && single > 1e-12 { // a member needs no pair
			t.Fatalf("pair %v (error %v) worse than single %v (%v)", p, e, s.Nearest(x), single)
		}
	})
}
