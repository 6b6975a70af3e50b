package response

import (
	"errors"
	"math"
	"math/big"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/floats"
)

// bigExp is e^x in big.Float arithmetic at the precision of x, by its
// Taylor series (of |x|, inverted for x < 0 so that no terms cancel;
// |x| ≤ 160 here).
func bigExp(x *big.Float) *big.Float {
	prec := x.Prec()
	if x.Sign() < 0 {
		e := bigExp(new(big.Float).SetPrec(prec).Neg(x))
		return e.Quo(new(big.Float).SetPrec(prec).SetInt64(1), e)
	}
	sum := new(big.Float).SetPrec(prec).SetInt64(1)
	term := new(big.Float).SetPrec(prec).SetInt64(1)
	for k := 1; k < 600; k++ {
		term.Mul(term, x)
		term.Quo(term, new(big.Float).SetPrec(prec).SetInt64(int64(k)))
		sum.Add(sum, term)
	}
	return sum
}

// TestNearRepeatedPoles: the impulse response of 1/Π(s − pᵢ) for m real
// poles pᵢ = −(1 + iδ) close together, against the distinct-pole formula
// Σᵢ e^{pᵢt}/Π_{j≠i}(pᵢ − pⱼ) evaluated in 256-bit arithmetic, where its
// cancellation (residues of size 1/δ^{m−1}) costs nothing. This covers
// exact repetition (δ = 0: the repeated-pole formula), clusters handled by
// the divided-difference series, and poles far enough apart for the plain
// residues.
func TestNearRepeatedPoles(t *testing.T) {
	ts := floats.Span(make([]float64, 41), 0, 40)
	const prec = 256
	for _, m := range []int{2, 3, 4} {
		for _, delta := range []float64{0, 1e-12, 1e-9, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.03, 0.1, 0.12, 0.2, 0.5, 1} {
			h := filter.Transfer{Gain: 1}
			for i := range m {
				h.Poles = append(h.Poles, complex(-(1+float64(i)*delta), 0))
			}
			got, _, err := Impulse(h, ts)
			if err != nil {
				t.Fatal(err)
			}
			var worst float64
			for k, x := range ts {
				var want float64
				if delta == 0 {
					want = math.Pow(x, float64(m-1)) / math.Gamma(float64(m)) * math.Exp(-x)
				} else {
					sum := new(big.Float).SetPrec(prec)
					for i := range m {
						pi := new(big.Float).SetPrec(prec).SetFloat64(real(h.Poles[i]))
						num := bigExp(new(big.Float).SetPrec(prec).Mul(pi, new(big.Float).SetPrec(prec).SetFloat64(x)))
						for j := range m {
							if j != i {
								d := new(big.Float).SetPrec(prec).Sub(pi, new(big.Float).SetPrec(prec).SetFloat64(real(h.Poles[j])))
								num.Quo(num, d)
							}
						}
						sum.Add(sum, num)
					}
					want, _ = sum.Float64()
				}
				worst = math.Max(worst, math.Abs(got[k]-want))
			}
			// The peak of the response is at most 1/e; 1e-15 absolute is a
			// few units of rounding of it.
			// The peak of the response is at most 1/e. Inside a cluster
			// (δ < 0.1) the error is rounding (≤ 6e-17 observed); poles
			// just outside the clustering distance keep the plain
			// residues, whose cancellation costs up to ε·(1/0.1)^{m−1}
			// (2.8e-14 observed at m = 4, δ = 0.12).
			if worst > 1e-13 {
				t.Errorf("m = %d, δ = %g: worst error %.3g, want ≤ 1e-13", m, delta, worst)
			}
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
	// A double integrator with a lag, 1/(s²(s+1)): step t²/2 − t + 1 − e^{−t}
	// (partial fractions of 1/(s³(s+1)), common practice).
	y, err = Step(filter.Transfer{Poles: []complex128{0, 0, -1}, Gain: 1}, ts)
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range ts {
		if want := x*x/2 - x + 1 - math.Exp(-x); math.Abs(y[i]-want) > 1e-15*(1+x*x) {
			t.Errorf("double integrator step y(%g) = %.16g, want %.16g", x, y[i], want)
		}
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

// TestFarZeros: a zero far beyond the poles makes the series at t = 0
// unusable (its coefficients overflow); the modal sum is used and the step
// stays right. H(s) = (1 − s/z)/(s + 1) has the step 1 − (1 + 1/z)·e^{−t}
// (partial fractions, common practice).
func TestFarZeros(t *testing.T) {
	z := 1e200
	h := filter.Transfer{Zeros: []complex128{complex(z, 0)}, Poles: []complex128{-1}, Gain: -1 / z}
	ts := []float64{0, 0.5, 2}
	y, err := Step(h, ts)
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range ts {
		want := 1 - (1+1/z)*math.Exp(-x)
		if math.IsNaN(y[i]) || math.Abs(y[i]-want) > 1e-15 {
			t.Errorf("y(%g) = %.16g, want %.16g", x, y[i], want)
		}
	}
}
