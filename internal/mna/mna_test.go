package mna

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// Tolerance levels. tight: a few hundred ulps, for direct solves of small
// well-scaled systems; interp: the interpolated coefficients, whose rounding
// is set by the spread of the scaled coefficients (up to ~1e4 here).
const (
	tight  = 1e-12
	interp = 1e-9
)

func relErr(got, want complex128) float64 {
	return cmplx.Abs(got-want) / cmplx.Abs(want)
}

// ladder builds an n-section RC ladder: series R then shunt C, node k at the
// junction of section k (node 1 is the input).
func ladder(n int) Netlist {
	net := Netlist{Nodes: n + 1, In: 1, Out: n + 1}
	for k := range n {
		net.Elements = append(net.Elements,
			Element{Kind: Resistor, A: k + 1, B: k + 2, Value: 2 * k},
			Element{Kind: Capacitor, A: k + 2, B: 0, Value: 2*k + 1})
	}
	return net
}

// ladderClosed is the ladder's transfer from its chain (ABCD) matrices, the
// textbook two-port cascade: [V1; I1] = Π [[1, R], [0, 1]]·[[1, 0], [sC, 1]]·[V2; 0],
// so H = V2/V1 = 1/A.
func ladderClosed(values []float64, s complex128) complex128 {
	a, b, c, d := complex(1, 0), complex(0, 0), complex(0, 0), complex(1, 0)
	for k := 0; k < len(values); k += 2 {
		r, y := complex(values[k], 0), s*complex(values[k+1], 0)
		// times [[1, r], [0, 1]]
		b, d = a*r+b, c*r+d
		// times [[1, 0], [y, 1]]
		a, c = a+b*y, c+d*y
	}
	return 1 / a
}

func TestLadderProperty(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 6).Draw(t, "sections")
		values := make([]float64, 2*n)
		for k := range n {
			values[2*k] = math.Pow(10, rapid.Float64Range(2, 6).Draw(t, "logR"))
			values[2*k+1] = math.Pow(10, rapid.Float64Range(-10, -6).Draw(t, "logC"))
		}
		net := ladder(n)
		if err := net.Check(len(values)); err != nil {
			t.Fatal(err)
		}
		w0 := RadiusOf(&net, values)
		s := complex(0, w0*math.Pow(10, rapid.Float64Range(-1, 1).Draw(t, "f")))
		var w Workspace
		h, _, err := w.Transfer(&net, values, Amp{}, s)
		if err != nil {
			t.Fatal(err)
		}
		want := ladderClosed(values, s)
		if e := relErr(h, want); e > tight*float64(n) {
			t.Fatalf("MNA %v, closed form %v, rel err %g", h, want, e)
		}
		// The interpolated rational function agrees too, and is all-pole of
		// degree n with H(0) = 1.
		if n <= 3 {
			r, err := RationalOf(&net, values, Amp{}, 0)
			if err != nil {
				t.Fatal(err)
			}
			if len(r.Num) != 1 || len(r.Den) != n+1 {
				t.Fatalf("degrees %d/%d, want 0/%d: %v", len(r.Num)-1, len(r.Den)-1, n, r)
			}
			if e := math.Abs(r.Num[0]/r.Den[0] - 1); e > interp {
				t.Fatalf("H(0) = %g", r.Num[0]/r.Den[0])
			}
			if e := relErr(r.At(s), want); e > interp {
				t.Fatalf("rational %v, closed %v, rel err %g", r.At(s), want, e)
			}
		}
	})
}

// TestSingleRC checks the RC lowpass coefficients exactly: H = 1/(1 + sRC).
func TestSingleRC(t *testing.T) {
	net := ladder(1)
	vals := []float64{10e3, 10e-9}
	r, err := RationalOf(&net, vals, Amp{}, 0)
	if err != nil {
		t.Fatal(err)
	}
	tau := 10e3 * 10e-9
	if len(r.Num) != 1 || len(r.Den) != 2 || math.Abs(r.Num[0]*tau-1) > tight || math.Abs(r.Den[0]*tau-1) > tight || r.Den[1] != 1 {
		t.Errorf("got %v, want num [1/τ], den [1/τ 1], τ = %g", r, tau)
	}
	z, p, k, err := r.ZerosPoles()
	if err != nil || len(z) != 0 || len(p) != 1 || math.Abs(real(p[0])*tau+1) > tight || math.Abs(k*tau-1) > tight {
		t.Errorf("zeros %v poles %v k %g err %v", z, p, k, err)
	}
}

func TestDivider(t *testing.T) {
	// R1 from in to out, R2 from out to ground: H = R2/(R1+R2).
	net := Netlist{Nodes: 2, In: 1, Out: 2, Elements: []Element{
		{Kind: Resistor, A: 1, B: 2, Value: 0},
		{Kind: Resistor, A: 2, B: 0, Value: 1},
	}}
	var w Workspace
	h, _, err := w.Transfer(&net, []float64{3e3, 1e3}, Amp{}, complex(0, 1))
	if err != nil || relErr(h, 0.25) > tight {
		t.Errorf("H = %v, err %v; want 0.25", h, err)
	}
}

// follower is a unity-gain buffer: op-amp + at node 1 (input), − and output at node 2.
var follower = Netlist{Nodes: 2, In: 1, Out: 2, Elements: []Element{
	{Kind: OpAmp, A: 1, B: 2, Out: 2},
	{Kind: Resistor, A: 2, B: 0, Value: 0}, // a load
}}

func TestFollowerIdealExactlyOne(t *testing.T) {
	var w Workspace
	for _, s := range []complex128{0, complex(0, 1), complex(0, 1e9), complex(-3, 5)} {
		h, _, err := w.Transfer(&follower, []float64{1e3}, Amp{}, s)
		if err != nil || h != 1 {
			t.Errorf("s=%v: H = %v, err %v; want exactly 1", s, h, err)
		}
	}
}

// TestFollowerNonIdeal: a follower with open-loop gain A has H = A/(1+A)
// (negative feedback around A), with A(s) = A0/(1 + s·A0/ωt); with output
// resistance Ro into load RL, the open-loop gain seen is A·RL/(RL+Ro) only in
// the open loop; closed loop H = A·RL/(RL + Ro + A·RL) (current through Ro
// and RL solved by hand: Vout = (A(V1−Vout) − ... ) from KCL).
func TestFollowerNonIdeal(t *testing.T) {
	amp := Amp{DCGain: 1e5, GBWHz: 1e6, ROutOhm: 50}
	rl := 1e3
	var w Workspace
	for _, f := range []float64{0, 10, 1e3, 1e5, 1e6} {
		s := complex(0, 2*math.Pi*f)
		a := 1 / (1/complex(amp.DCGain, 0) + s/complex(2*math.Pi*amp.GBWHz, 0))
		// Vx = A(V1 − Vo); Vo = Vx·RL/(RL+Ro) → Vo = A·RL/(RL + Ro + A·RL).
		want := a * complex(rl, 0) / complex(rl+amp.ROutOhm, 0) / (1 + a*complex(rl/(rl+amp.ROutOhm), 0))
		h, _, err := w.Transfer(&follower, []float64{rl}, amp, s)
		if err != nil || relErr(h, want) > tight {
			t.Errorf("f=%g: H = %v, want %v, err %v", f, h, want, err)
		}
	}
	// Rational form: degree 1 (one op-amp pole), pole at −ωt·(1+A0)/A0·RL/(RL+Ro)… check against Transfer.
	r, err := RationalOf(&follower, []float64{rl}, amp, 2*math.Pi*amp.GBWHz)
	if err != nil || len(r.Den) != 2 {
		t.Fatalf("rational %v err %v", r, err)
	}
	for _, f := range []float64{10, 1e5, 3e6} {
		s := complex(0, 2*math.Pi*f)
		h, _, _ := w.Transfer(&follower, []float64{rl}, amp, s)
		if e := relErr(r.At(s), h); e > interp {
			t.Errorf("f=%g: rational %v, MNA %v", f, r.At(s), h)
		}
	}
}

// TestInverting: inverting amplifier Rf/Rin = 4.7: H = −4.7 exactly
// (ideal op-amp, virtual ground).
func TestInverting(t *testing.T) {
	net := Netlist{Nodes: 3, In: 1, Out: 3, Elements: []Element{
		{Kind: Resistor, A: 1, B: 2, Value: 0},
		{Kind: Resistor, A: 2, B: 3, Value: 1},
		{Kind: OpAmp, A: 0, B: 2, Out: 3},
	}}
	var w Workspace
	h, _, err := w.Transfer(&net, []float64{10e3, 47e3}, Amp{}, complex(0, 100))
	if err != nil || relErr(h, -4.7) > tight {
		t.Errorf("H = %v, err %v", h, err)
	}
}

func TestRoots(t *testing.T) {
	// (s+1)(s+2)(s+3)(s²+s+1): known roots.
	c := []float64{6, 17, 23, 18, 7, 1}
	r, err := Roots(c)
	if err != nil {
		t.Fatal(err)
	}
	want := []complex128{-1, -2, -3, complex(-0.5, math.Sqrt(3)/2), complex(-0.5, -math.Sqrt(3)/2)}
	for _, w := range want {
		best := math.Inf(1)
		for _, z := range r {
			best = math.Min(best, cmplx.Abs(z-w))
		}
		if best > 1e-12 {
			t.Errorf("root %v missing from %v", w, r)
		}
	}
	if _, err := Roots([]float64{0, 0}); !errors.Is(err, ErrDegree) {
		t.Errorf("zero polynomial: err %v", err)
	}
	if _, err := Roots([]float64{1, math.NaN(), 1}); !errors.Is(err, ErrValue) {
		t.Errorf("NaN: err %v", err)
	}
}

func TestBadNetlists(t *testing.T) {
	tests := []struct {
		reason string
		net    Netlist
		nv     int
	}{
		{"no nodes", Netlist{}, 0},
		{"output out of range", Netlist{Nodes: 1, In: 1, Out: 2}, 0},
		{"node out of range", Netlist{Nodes: 1, In: 1, Out: 1, Elements: []Element{{Kind: Resistor, A: 1, B: 5}}}, 1},
		{"value index", Netlist{Nodes: 1, In: 1, Out: 1, Elements: []Element{{Kind: Resistor, A: 1, B: 0, Value: 1}}}, 1},
		{"op-amp drives ground", Netlist{Nodes: 1, In: 1, Out: 1, Elements: []Element{{Kind: OpAmp, A: 1, B: 0, Out: 0}}}, 0},
		{"unknown kind", Netlist{Nodes: 1, In: 1, Out: 1, Elements: []Element{{Kind: 9}}}, 0},
		{"too large", Netlist{Nodes: MaxDim, In: 1, Out: 1}, 0},
	}
	for _, tc := range tests {
		if err := tc.net.Check(tc.nv); !errors.Is(err, ErrNetlist) {
			t.Errorf("%s: err %v", tc.reason, err)
		}
	}
	if err := CheckValues([]float64{1, 0}); !errors.Is(err, ErrValue) {
		t.Errorf("zero value: %v", err)
	}
	if err := (Amp{GBWHz: math.NaN()}).Check(); !errors.Is(err, ErrValue) {
		t.Errorf("NaN GBW: %v", err)
	}
	// A floating node makes the matrix singular.
	net := Netlist{Nodes: 2, In: 1, Out: 2, Elements: []Element{{Kind: Capacitor, A: 1, B: 0, Value: 0}}}
	var w Workspace
	if _, _, err := w.Transfer(&net, []float64{1e-9}, Amp{}, complex(0, 1)); !errors.Is(err, ErrSingular) {
		t.Errorf("floating node: err %v", err)
	}
}

func TestTransferAllocs(t *testing.T) {
	net := ladder(4)
	vals := []float64{1e3, 1e-8, 2e3, 1e-8, 3e3, 1e-8, 4e3, 1e-8}
	var w Interpolator
	num, den := make([]float64, 5), make([]float64, 5)
	allocs := testing.AllocsPerRun(100, func() {
		_, _, _ = w.Transfer(&net, vals, Amp{}, complex(0, 1e4))
		_ = w.Coefficients(&net, vals, Amp{}, 1e4, num, den)
	})
	if allocs != 0 {
		t.Errorf("%v allocs per run, want 0", allocs)
	}
}
