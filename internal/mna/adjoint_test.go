package mna

import (
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// TestAdjointMatchesDirect checks every entry of the adjoint solve against
// a direct solve of the same matrix with that one source inserted (the
// right-hand side unit in the entry's row, the input source at zero): the
// two must agree to rounding for random ladders (with and without a follower behind them) and random frequencies.
func TestAdjointMatchesDirect(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 6).Draw(t, "n")
		net := ladder(n)
		if rapid.Bool().Draw(t, "buffered") {
			// A follower after the ladder: an op-amp row in the system.
			net.Nodes++
			net.Elements = append(net.Elements, Element{Kind: OpAmp, A: n + 1, B: n + 2, Out: n + 2})
			net.Out = n + 2
		}
		values := make([]float64, 2*n)
		for i := range values {
			values[i] = math.Pow(10, rapid.Float64Range(-1, 1).Draw(t, "v"))
		}
		w0 := RadiusOf(&net, values)
		s := complex(0, w0*math.Pow(10, rapid.Float64Range(-1.5, 1.5).Draw(t, "f")))
		var w Workspace
		d := net.Dim()
		y := make([]complex128, d)
		if err := w.Adjoint(&net, values, Amp{}, s, y); err != nil {
			t.Fatal(err)
		}
		for r := range d {
			var v Workspace
			v.stamp(&net, values, Amp{}, s)
			clear(v.b[:d])
			v.b[r] = 1
			x, _, err := v.solveRec(d, net.Out-1, nil)
			if err != nil {
				t.Fatal(err)
			}
			if e := cmplx.Abs(x - y[r]); e > 1e-12*(1+cmplx.Abs(x)) {
				t.Fatalf("row %d: adjoint %v, direct %v", r, y[r], x)
			}
		}
	})
}

// TestAdjointRC checks the one-section RC lowpass by hand: a current i
// injected at the capacitor's node gives V = i·R/(1 + sRC) there.
func TestAdjointRC(t *testing.T) {
	net := ladder(1)
	vals := []float64{10e3, 10e-9}
	s := complex(0, 2*math.Pi*1e3)
	y := make([]complex128, net.Dim())
	var w Workspace
	if err := w.Adjoint(&net, vals, Amp{}, s, y); err != nil {
		t.Fatal(err)
	}
	want := complex(10e3, 0) / (1 + s*complex(10e3*10e-9, 0))
	if e := cmplx.Abs(y[net.Out-1]-want) / cmplx.Abs(want); e > 1e-14 {
		t.Errorf("transimpedance %v, want %v", y[net.Out-1], want)
	}
	// The input node is held by the source: a current there goes into it.
	if cmplx.Abs(y[net.In-1]) > 1e-20 {
		t.Errorf("input node transfer %v, want 0", y[net.In-1])
	}
}
