package response

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/floats"
)

// TestNearRepeatedPoles: for two real poles a and b = a(1+δ) the impulse
// response is e^{−at}·(1 − e^{−(b−a)t})/(b − a), evaluated stably with
// expm1 (common practice); this checks the merging of close poles into a
// repeated one (δ ≤ 1e-5) and the plain partial fractions beyond, across
// the merging threshold. The worst error is at δ just above the threshold,
// where cancellation between residues of size 1/δ costs ε/δ ≈ 2e-11.
func TestNearRepeatedPoles(t *testing.T) {
	ts := floats.Span(make([]float64, 101), 0, 10)
	for _, delta := range []float64{0, 1e-12, 1e-9, 1e-6, 9e-6, 1.1e-5, 1e-4, 1e-2, 1} {
		a := 1.0
		b := a * (1 + delta)
		h := filter.Transfer{Poles: []complex128{complex(-a, 0), complex(-b, 0)}, Gain: 1}
		got, _, err := Impulse(h, ts)
		if err != nil {
			t.Fatal(err)
		}
		var worst float64
		for i, x := range ts {
			want := x * math.Exp(-a*x)
			if d := (b - a) * x; d != 0 {
				want = math.Exp(-a*x) * -math.Expm1(-d) / (b - a)
			}
			worst = math.Max(worst, math.Abs(got[i]-want))
		}
		// Peak of the response is 1/e ≈ 0.37.
		if worst > 1e-10 {
			t.Errorf("δ = %g: worst error %.3g, want ≤ 1e-10", delta, worst)
		}
	}
}

// TestRepeatedPoleExact: 1/(s+1)^m has the impulse response t^{m−1}/(m−1)!·e^{−t}
// (the Laplace transform pair from memory of Abramowitz and Stegun 29.3.11).
func TestRepeatedPoleExact(t *testing.T) {
	ts := floats.Span(make([]float64, 41), 0, 20)
	for m := 1; m <= 8; m++ {
		h := filter.Transfer{Gain: 1}
		for range m {
			h.Poles = append(h.Poles, -1)
		}
		got, dirac, err := Impulse(h, ts)
		if err != nil || dirac != 0 {
			t.Fatalf("m = %d: dirac %g, err %v", m, dirac, err)
		}
		want := make([]float64, len(ts))
		for i, x := range ts {
			want[i] = math.Pow(x, float64(m-1)) / math.Gamma(float64(m)) * math.Exp(-x)
		}
		if d := cmp.Diff(want, got, cmpopts.EquateApprox(0, 1e-14)); d != "" {
			t.Errorf("m = %d (-want +got):\n%s", m, d)
		}
	}
}

// TestPoleZeroCancellation: a zero on a pole cancels it exactly.
func TestPoleZeroCancellation(t *testing.T) {
	ts := []float64{0, 0.5, 1, 2}
	h := filter.Transfer{Zeros: []complex128{-3}, Poles: []complex128{-1, -3}, Gain: 1}
	got, err := Step(h, ts)
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range ts {
		if want := 1 - math.Exp(-x); math.Abs(got[i]-want) > 1e-15 {
			t.Errorf("y(%g) = %.16g, want %.16g", x, got[i], want)
		}
	}
}

// TestIntegrator: a pole at the origin is allowed; the step of 1/s is the
// ramp t, and an unstable pole grows as e^{t}.
func TestIntegratorAndUnstable(t *testing.T) {
	ts := []float64{0, 1, 2.5}
	y, err := Step(filter.Transfer{Poles: []complex128{0}, Gain: 1}, ts)
	if err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(ts, y, cmpopts.EquateApprox(0, 1e-15)); d != "" {
		t.Errorf("ramp (-want +got):\n%s", d)
	}
	y, err = Step(filter.Transfer{Poles: []complex128{1}, Gain: 1}, ts)
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range ts {
		if want := math.Expm1(x); math.Abs(y[i]-want) > 1e-14*math.Abs(want) {
			t.Errorf("unstable step y(%g) = %g, want %g", x, y[i], want)
		}
	}
}

func TestTimeErrors(t *testing.T) {
	ok := filter.Transfer{Poles: []complex128{-1}, Gain: 1}
	cases := []struct {
		reason string
		h      filter.Transfer
		t      []float64
		want   error
	}{
		{"more zeros than poles", filter.Transfer{Zeros: []complex128{-1, -2}, Poles: []complex128{-1}, Gain: 1}, []float64{0}, ErrSystem},
		{"NaN gain", filter.Transfer{Poles: []complex128{-1}, Gain: math.NaN()}, []float64{0}, ErrSystem},
		{"infinite pole", filter.Transfer{Poles: []complex128{complex(math.Inf(-1), 0)}, Gain: 1}, []float64{0}, ErrSystem},
		{"complex pole without conjugate", filter.Transfer{Poles: []complex128{-1 + 1i}, Gain: 1}, []float64{0}, ErrSystem},
		{"complex zero without conjugate", filter.Transfer{Zeros: []complex128{1i}, Poles: []complex128{-1, -2}, Gain: 1}, []float64{0}, ErrSystem},
		{"negative time", ok, []float64{0, -1}, ErrGrid},
		{"NaN time", ok, []float64{math.NaN()}, ErrGrid},
		{"infinite time", ok, []float64{math.Inf(1)}, ErrGrid},
	}
	for _, c := range cases {
		if _, err := Step(c.h, c.t); !errors.Is(err, c.want) {
			t.Errorf("%s: Step error %v, want %v", c.reason, err, c.want)
		}
		if _, _, err := Impulse(c.h, c.t); !errors.Is(err, c.want) {
			t.Errorf("%s: Impulse error %v, want %v", c.reason, err, c.want)
		}
	}
}

func TestIntoPanicsOnLength(t *testing.T) {
	h := filter.Transfer{Poles: []complex128{-1}, Gain: 1}
	for name, f := range map[string]func(){
		"StepInto":    func() { _, _ = StepInto(make([]float64, 2), h, []float64{0}) },
		"ImpulseInto": func() { _, _, _ = ImpulseInto(make([]float64, 2), h, []float64{0}) },
		"SweepInto":   func() { SweepInto(make([]Point, 2), h, []float64{1}) },
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s with a dst of the wrong length did not panic", name)
				}
			}()
			f()
		}()
	}
}

func TestZeroTransfer(t *testing.T) {
	y, err := Step(filter.Transfer{}, []float64{0, 1})
	if err != nil || y[0] != 0 || y[1] != 0 {
		t.Errorf("step of H = 0: %v, %v", y, err)
	}
	// A constant gain: step K, impulse K·δ.
	y, err = Step(filter.Transfer{Gain: 3}, []float64{0, 1})
	if err != nil || y[0] != 3 || y[1] != 3 {
		t.Errorf("step of H = 3: %v, %v", y, err)
	}
	imp, d, err := Impulse(filter.Transfer{Gain: 3}, []float64{0, 1})
	if err != nil || d != 3 || imp[0] != 0 || imp[1] != 0 {
		t.Errorf("impulse of H = 3: %v, dirac %g, %v", imp, d, err)
	}
}
