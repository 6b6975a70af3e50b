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

// TestAdjointNyquist checks the adjoint transfers against Nyquist's theorem
// for passive networks (Nyquist, 1928; from memory of circuit-noise texts):
// the thermal noise of all the resistors of a passive RC network, seen at
// a port, is that of the port's driving-point impedance, Σ 4kT·|z_R|²/R =
// 4kT·Re Z. Here the port is the ladder's output with its input grounded
// by the source, z_R the transimpedance from a resistor's noise current to
// the output (y[b] − y[a]) and Z = y[Out], the output's own (a current
// injected there). Random ladders whose rungs carry a series resistor and
// capacitor as well, so that every resistor's transfer is complex.
func TestAdjointNyquist(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 5).Draw(t, "n")
		net := ladder(n)
		nv := 2 * n
		// A resistor to ground in series with a capacitor on some nodes:
		// a new node per such rung.
		for k := range n {
			if rapid.Bool().Draw(t, "rung") {
				net.Nodes++
				x := net.Nodes
				net.Elements = append(net.Elements,
					Element{Kind: Resistor, A: k + 2, B: x, Value: nv},
					Element{Kind: Capacitor, A: x, B: 0, Value: nv + 1})
				nv += 2
			}
		}
		values := make([]float64, nv)
		for i := range values {
			values[i] = math.Pow(10, rapid.Float64Range(-1, 1).Draw(t, "v"))
		}
		w0 := RadiusOf(&net, values)
		s := complex(0, w0*math.Pow(10, rapid.Float64Range(-1.5, 1.5).Draw(t, "f")))
		y := make([]complex128, net.Dim())
		var w Workspace
		if err := w.Adjoint(&net, values, Amp{}, s, y); err != nil {
			t.Fatal(err)
		}
		at := func(node int) complex128 {
			if node == 0 {
				return 0
			}
			return y[node-1]
		}
		sum := 0.0
		for _, e := range net.Elements {
			if e.Kind == Resistor {
				z := at(e.B) - at(e.A)
				sum += (real(z)*real(z) + imag(z)*imag(z)) / values[e.Value]
			}
		}
		re := real(y[net.Out-1])
		if !(math.Abs(sum-re) <= 1e-12*math.Abs(re)+1e-15*cmplx.Abs(y[net.Out-1])) {
			t.Fatalf("Σ|z|²/R = %g, Re Z = %g (Z = %v)", sum, re, y[net.Out-1])
		}
	})
}

// TestSolveMatchesTransfer checks Solve's node voltages against Transfer
// (the output node) and against the ladder's closed form at every node
// (each node of an RC ladder is the output of the ladder cut there, loaded
// by the rest: checked by solving the cut ladder with Transfer).
func TestSolveMatchesTransfer(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		n := rapid.IntRange(1, 6).Draw(t, "n")
		net := ladder(n)
		values := make([]float64, 2*n)
		for i := range values {
			values[i] = math.Pow(10, rapid.Float64Range(-1, 1).Draw(t, "v"))
		}
		s := complex(0, RadiusOf(&net, values)*math.Pow(10, rapid.Float64Range(-1.5, 1.5).Draw(t, "f")))
		var w Workspace
		x := make([]complex128, net.Dim())
		if err := w.Solve(&net, values, Amp{}, s, x); err != nil {
			t.Fatal(err)
		}
		for node := 1; node <= net.Nodes; node++ {
			cut := net
			cut.Out = node
			h, _, err := w.Transfer(&cut, values, Amp{}, s)
			if err != nil {
				t.Fatal(err)
			}
			if e := cmplx.Abs(x[node-1] - h); e > 1e-12*(1+cmplx.Abs(h)) {
				t.Fatalf("node %d: Solve %v, Transfer %v", node, x[node-1], h)
			}
		}
		if cmplx.Abs(x[net.In-1]-1) > 1e-14 {
			t.Fatalf("input node %v, want 1", x[net.In-1])
		}
	})
}
