package mna

import (
	"errors"
	"math"
	"testing"

	"pgregory.net/rapid"
)

// Netlists of the kind the topology templates are made of (from the
// circuits' textbook forms, common practice), for FixedInterpolator.
var (
	// mfbBandpass: R1 in→a, R2 a→0, C1 a→b, C2 a→out, R3 b→out, op-amp
	// + grounded, − at b.
	mfbBandpass = Netlist{Nodes: 4, In: 1, Out: 4, Elements: []Element{
		{Kind: Resistor, A: 1, B: 2, Value: 0},
		{Kind: Resistor, A: 2, B: 0, Value: 1},
		{Kind: Capacitor, A: 2, B: 3, Value: 2},
		{Kind: Capacitor, A: 2, B: 4, Value: 3},
		{Kind: Resistor, A: 3, B: 4, Value: 4},
		{Kind: OpAmp, A: 0, B: 3, Out: 4},
	}}
	// sallenKey: unity-gain lowpass, R1 in→a, R2 a→b, C1 a→out, C2 b→0,
	// follower from b to out.
	sallenKey = Netlist{Nodes: 4, In: 1, Out: 4, Elements: []Element{
		{Kind: Resistor, A: 1, B: 2, Value: 0},
		{Kind: Resistor, A: 2, B: 3, Value: 1},
		{Kind: Capacitor, A: 2, B: 4, Value: 2},
		{Kind: Capacitor, A: 3, B: 0, Value: 3},
		{Kind: OpAmp, A: 3, B: 4, Out: 4},
	}}
	// mfbHighpass: three capacitors, second order (the op-amp constraint).
	mfbHighpass = Netlist{Nodes: 4, In: 1, Out: 4, Elements: []Element{
		{Kind: Capacitor, A: 1, B: 2, Value: 0},
		{Kind: Capacitor, A: 2, B: 3, Value: 1},
		{Kind: Capacitor, A: 2, B: 4, Value: 2},
		{Kind: Resistor, A: 2, B: 0, Value: 3},
		{Kind: Resistor, A: 3, B: 4, Value: 4},
		{Kind: OpAmp, A: 0, B: 3, Out: 4},
	}}
	// towThomas: a damped integrator, an integrator and an inverter in a
	// loop; nodes in, n1, o1, n2, o2, n3, o3; lowpass output o2.
	towThomas = Netlist{Nodes: 7, In: 1, Out: 5, Elements: []Element{
		{Kind: Resistor, A: 1, B: 2, Value: 0},
		{Kind: Resistor, A: 2, B: 3, Value: 1},
		{Kind: Capacitor, A: 2, B: 3, Value: 2},
		{Kind: OpAmp, A: 0, B: 2, Out: 3},
		{Kind: Resistor, A: 3, B: 4, Value: 3},
		{Kind: Capacitor, A: 4, B: 5, Value: 4},
		{Kind: OpAmp, A: 0, B: 4, Out: 5},
		{Kind: Resistor, A: 5, B: 6, Value: 5},
		{Kind: Resistor, A: 6, B: 7, Value: 6},
		{Kind: OpAmp, A: 0, B: 6, Out: 7},
		{Kind: Resistor, A: 7, B: 2, Value: 7},
	}}
)

// drawNetlist draws one of the fixed netlists or a random RC network
// (random connections among a few nodes, possibly floating or singular,
// which the general path must then report the same way).
func drawNetlist(t *rapid.T) (Netlist, []float64) {
	kind := rapid.IntRange(0, 5).Draw(t, "netlist")
	var net Netlist
	switch kind {
	case 0:
		net = ladder(rapid.IntRange(1, 5).Draw(t, "sections"))
	case 1:
		net = mfbBandpass
	case 2:
		net = sallenKey
	case 3:
		net = mfbHighpass
	case 4:
		net = towThomas
	default:
		nodes := rapid.IntRange(2, 6).Draw(t, "nodes")
		net = Netlist{Nodes: nodes, In: 1, Out: rapid.IntRange(2, nodes).Draw(t, "out")}
		parts := rapid.IntRange(1, 10).Draw(t, "parts")
		for k := range parts {
			kd := Resistor
			if rapid.Bool().Draw(t, "cap") {
				kd = Capacitor
			}
			net.Elements = append(net.Elements, Element{Kind: kd,
				A: rapid.IntRange(0, nodes).Draw(t, "a"), B: rapid.IntRange(0, nodes).Draw(t, "b"), Value: k})
		}
		if rapid.Bool().Draw(t, "opamp") {
			net.Elements = append(net.Elements, Element{Kind: OpAmp,
				A: rapid.IntRange(0, nodes).Draw(t, "plus"), B: rapid.IntRange(0, nodes).Draw(t, "minus"),
				Out: rapid.IntRange(1, nodes).Draw(t, "opout")})
		}
	}
	nv := 0
	for _, e := range net.Elements {
		if e.Kind != OpAmp {
			nv = max(nv, e.Value+1)
		}
	}
	ref := make([]float64, nv)
	for _, e := range net.Elements {
		switch e.Kind {
		case Resistor:
			ref[e.Value] = math.Pow(10, rapid.Float64Range(2, 6).Draw(t, "logR"))
		case Capacitor:
			ref[e.Value] = math.Pow(10, rapid.Float64Range(-11, -6).Draw(t, "logC"))
		}
	}
	return net, ref
}

// sameBits reports whether x and y are the same float64s, bit for bit.
func sameBits(x, y []float64) bool {
	for i := range x {
		if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
			return false
		}
	}
	return true
}

// TestFixedInterpolatorBitIdentical: FixedInterpolator.Coefficients equals
// Interpolator.Coefficients bit for bit (and in its errors) for values near
// and far from the reference values, ideal and non-ideal op-amps, over
// random netlists; and the fast path is the one taken near the reference.
func TestFixedInterpolatorBitIdentical(t *testing.T) {
	var fast, near int
	rapid.Check(t, func(t *rapid.T) {
		net, ref := drawNetlist(t)
		if net.Check(len(ref)) != nil {
			return
		}
		amp := Amp{}
		if rapid.Bool().Draw(t, "nonideal") {
			amp = Amp{DCGain: 1e5, GBWHz: 1e6, ROutOhm: rapid.SampledFrom([]float64{0, 50}).Draw(t, "rout")}
		}
		m := max(net.Degree(amp)+1, rapid.IntRange(1, 4).Draw(t, "m"))
		radius := RadiusOf(&net, ref) * math.Pow(10, rapid.Float64Range(-1, 1).Draw(t, "logRadius"))
		f, err := NewFixedInterpolator(&net, ref, amp, radius, m)
		if err != nil {
			t.Fatal(err)
		}
		spread := rapid.SampledFrom([]float64{0, 0.01, 0.1, 1, 3}).Draw(t, "spread")
		var g Interpolator
		v := make([]float64, len(ref))
		n1, d1 := make([]float64, m), make([]float64, m)
		n2, d2 := make([]float64, m), make([]float64, m)
		for trial := range 20 {
			for i, x := range ref {
				v[i] = x * math.Exp(spread*rapid.Float64Range(-1, 1).Draw(t, "u"))
			}
			err1 := f.Coefficients(v, n1, d1)
			err2 := g.Coefficients(&net, v, amp, radius, n2, d2)
			if (err1 == nil) != (err2 == nil) || err1 != nil && err1.Error() != err2.Error() {
				t.Fatalf("trial %d: errors %v and %v", trial, err1, err2)
			}
			if err1 == nil && (!sameBits(n1, n2) || !sameBits(d1, d2)) {
				t.Fatalf("trial %d, fast path %v: num %v den %v, general %v %v", trial, f.last == 0, n1, d1, n2, d2)
			}
			// The same sets through CoefficientsLanes, with sets drawn
			// around this one (different spreads: lanes that take the
			// general path beside lanes that do not).
			nl := rapid.IntRange(1, Lanes).Draw(t, "lanes")
			lv := make([][]float64, nl)
			ln, ld := make([][]float64, nl), make([][]float64, nl)
			lerr := make([]error, nl)
			for l := range lv {
				lv[l] = append([]float64(nil), v...)
				if l > 0 {
					sp := rapid.SampledFrom([]float64{0, 0.01, 1, 3}).Draw(t, "laneSpread")
					for i, x := range ref {
						lv[l][i] = x * math.Exp(sp*rapid.Float64Range(-1, 1).Draw(t, "lu"))
					}
				}
				ln[l], ld[l] = make([]float64, m), make([]float64, m)
			}
			f.CoefficientsLanes(lv, ln, ld, lerr)
			for l := range lv {
				e2 := g.Coefficients(&net, lv[l], amp, radius, n2, d2)
				if (lerr[l] == nil) != (e2 == nil) || e2 != nil && lerr[l].Error() != e2.Error() {
					t.Fatalf("trial %d lane %d: errors %v and %v", trial, l, lerr[l], e2)
				}
				if e2 == nil && (!sameBits(ln[l], n2) || !sameBits(ld[l], d2)) {
					t.Fatalf("trial %d lane %d: num %v den %v, general %v %v", trial, l, ln[l], ld[l], n2, d2)
				}
			}
			g.Coefficients(&net, v, amp, radius, n2, d2)
			if spread <= 0.01 && err2 == nil && net.Elements[0].Kind == Resistor && len(net.Elements) >= 2 && err1 == nil {
				near++
				if f.last == 0 {
					fast++
				}
			}
		}
	})
	// Near the reference values the pivot order is the reference's:
	// nearly every evaluation must take the fast path.
	if near == 0 || float64(fast) < 0.9*float64(near) {
		t.Errorf("fast path taken %d times of %d near the reference", fast, near)
	}
	t.Logf("fast path %d of %d near the reference", fast, near)
}

// TestFixedInterpolatorFallback: values that give a singular matrix, slices
// of another length, and a netlist singular at its reference values all
// take the general path and report its errors.
func TestFixedInterpolatorFallback(t *testing.T) {
	net := ladder(2)
	ref := []float64{1e3, 1e-8, 2e3, 1e-8}
	f, err := NewFixedInterpolator(&net, ref, Amp{}, 1e5, 3)
	if err != nil {
		t.Fatal(err)
	}
	num, den := make([]float64, 3), make([]float64, 3)
	if err := f.Coefficients(ref, num, den); err != nil || f.last != 0 {
		t.Fatalf("reference values: err %v, general path %v", err, f.last == 1)
	}
	if err := f.Coefficients(ref, num[:2], den[:2]); !errors.Is(err, ErrDegree) {
		t.Errorf("short slices: err %v, want ErrDegree", err)
	}
	// An overflowing admittance: the general path's answer, whatever it is.
	bad := []float64{1e3, 1e307, 2e3, 1e-8}
	var g Interpolator
	n2, d2 := make([]float64, 3), make([]float64, 3)
	err1 := f.Coefficients(bad, num, den)
	err2 := g.Coefficients(&net, bad, Amp{}, 1e5, n2, d2)
	if (err1 == nil) != (err2 == nil) || err1 == nil && (!sameBits(num, n2) || !sameBits(den, d2)) {
		t.Errorf("overflow: %v %v %v, general %v %v %v", num, den, err1, n2, d2, err2)
	}
	if f.last != 1 {
		t.Errorf("overflow took the fast path")
	}
	// Node 2 connected to nothing: a zero row.
	floating := Netlist{Nodes: 2, In: 1, Out: 2, Elements: []Element{{Kind: Capacitor, A: 1, B: 0, Value: 0}}}
	f, err = NewFixedInterpolator(&floating, []float64{1e-9}, Amp{}, 1e3, 2)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.Coefficients([]float64{1e-9}, num[:2], den[:2]); !errors.Is(err, ErrSingular) {
		t.Errorf("floating node: err %v, want ErrSingular", err)
	}
	if _, err := NewFixedInterpolator(&Netlist{}, nil, Amp{}, 1, 2); !errors.Is(err, ErrNetlist) {
		t.Errorf("bad netlist: err %v, want ErrNetlist", err)
	}
}

func TestFixedInterpolatorAllocs(t *testing.T) {
	vals := []float64{10e3, 2e3, 1e-8, 1e-8, 100e3}
	f, err := NewFixedInterpolator(&mfbBandpass, vals, Amp{}, RadiusOf(&mfbBandpass, vals), 3)
	if err != nil {
		t.Fatal(err)
	}
	num, den := make([]float64, 3), make([]float64, 3)
	lv := [][]float64{vals, vals, vals}
	ln := [][]float64{make([]float64, 3), make([]float64, 3), make([]float64, 3)}
	ld := [][]float64{make([]float64, 3), make([]float64, 3), make([]float64, 3)}
	lerr := make([]error, 3)
	allocs := testing.AllocsPerRun(100, func() {
		f.CoefficientsLanes(lv, ln, ld, lerr)
		_ = f.Coefficients(vals, num, den)
	})
	if allocs != 0 || f.last != 0 {
		t.Errorf("%v allocs per run (general path %v), want 0 on the fast path", allocs, f.last == 1)
	}
}
