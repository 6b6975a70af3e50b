package response

import (
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
	"gonum.org/v1/gonum/mat"
)

// TestFactFirstOrderStep: a first-order lowpass reaches 1 − e⁻¹ = 63.2 % of
// its final value at t = τ (common practice), its 10–90 % rise time is
// τ·ln 9 and it settles into 1 % at τ·ln 100 (the same exponential).
func TestFactFirstOrderStep(t *testing.T) {
	const tau = 1e-3
	h := filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1 / (2 * math.Pi * tau), Gain: 2}.Transfer()
	y, err := Step(h, []float64{0, tau, 5 * tau})
	if err != nil {
		t.Fatal(err)
	}
	if got, want := y[1]/2, 1-math.Exp(-1); math.Abs(got-want) > 1e-14 {
		t.Errorf("y(τ)/y(∞) = %.16g, want %.16g (63.2 %%)", got, want)
	}
	if y[0] != 0 {
		t.Errorf("y(0) = %g, want 0", y[0])
	}
	st, err := MeasureStep(h, 0.01)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(st.RiseS-tau*math.Log(9)) > 1e-11*tau {
		t.Errorf("rise time %.15g s, want τ·ln 9 = %.15g s", st.RiseS, tau*math.Log(9))
	}
	if math.Abs(st.SettleS-tau*math.Log(100)) > 1e-11*tau {
		t.Errorf("1 %% settling %.15g s, want τ·ln 100 = %.15g s", st.SettleS, tau*math.Log(100))
	}
	if st.OvershootPct != 0 || st.FinalValue != 2 {
		t.Errorf("overshoot %g %%, final %g; want 0 %%, 2", st.OvershootPct, st.FinalValue)
	}
}

// TestFactButterworth2Overshoot: the second-order Butterworth (ζ = 1/√2)
// overshoots by exp(−πζ/√(1−ζ²)) = exp(−π) = 4.32 % at the peak time
// π/ω_d = π·√2/ω0 (from memory of Ogata, Modern Control Engineering, the
// second-order step response).
func TestFactButterworth2Overshoot(t *testing.T) {
	const f0 = 1000.0
	h := filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: f0, Q: 1 / math.Sqrt2, Gain: 1}.Transfer()
	st, err := MeasureStep(h, 0.01)
	if err != nil {
		t.Fatal(err)
	}
	if want := 100 * math.Exp(-math.Pi); math.Abs(st.OvershootPct-want) > 1e-9 {
		t.Errorf("overshoot %.12g %%, want exp(−π) = %.12g %%", st.OvershootPct, want)
	}
	if want := math.Pi * math.Sqrt2 / (2 * math.Pi * f0); math.Abs(st.PeakS-want) > 1e-6*want {
		t.Errorf("peak time %.10g s, want %.10g s", st.PeakS, want)
	}
}

// reverseBesselPoles returns the poles of 1/θₙ(s), θₙ the reverse Bessel
// polynomial with coefficients aₖ = (2n−k)! / (2^{n−k} k! (n−k)!) (from
// memory of Thomson's delay-normalized Bessel filter, as tabulated in
// Zverev, Handbook of Filter Synthesis), as the eigenvalues of its
// companion matrix.
func reverseBesselPoles(t *testing.T, n int) (poles []complex128, a0 float64) {
	fact := func(k int) float64 { return math.Gamma(float64(k + 1)) }
	a := make([]float64, n+1)
	for k := 0; k <= n; k++ {
		a[k] = fact(2*n-k) / (math.Pow(2, float64(n-k)) * fact(k) * fact(n-k))
	}
	c := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		c.Set(0, i, -a[n-1-i]/a[n])
		if i > 0 {
			c.Set(i, i-1, 1)
		}
	}
	var eig mat.Eigen
	if !eig.Factorize(c, mat.EigenNone) {
		t.Fatalf("order %d: eigenvalues did not converge", n)
	}
	return eig.Values(nil), a[0]
}

// TestFactBesselDelay: a delay-normalized Bessel filter has a group delay of
// exactly 1 s at DC (its defining property, Thomson's maximally flat delay),
// for every order; the order-4 poles agree with the handbook values
// −2.8962 ± 0.8672j and −2.1038 ± 2.6574j (from memory of the
// delay-normalized Bessel pole table in Williams and Taylor, Electronic
// Filter Design Handbook).
func TestFactBesselDelay(t *testing.T) {
	for n := 1; n <= 10; n++ {
		poles, a0 := reverseBesselPoles(t, n)
		h := filter.Transfer{Poles: poles, Gain: a0}
		pt := Sweep(h, []float64{0})
		for _, p := range pt {
			if math.Abs(p.DelayS-1) > 1e-11 {
				t.Errorf("order %d: delay at %g Hz = %.15g s, want 1 s", n, p.Hz, p.DelayS)
			}
		}
		if math.Abs(pt[0].GainDB) > 1e-11 {
			t.Errorf("order %d: DC gain %g dB, want 0", n, pt[0].GainDB)
		}
		if n == 4 {
			for _, want := range []complex128{-2.8962 + 0.8672i, -2.1038 + 2.6574i} {
				found := false
				for _, p := range poles {
					if math.Abs(real(p)-real(want)) < 1e-4 && math.Abs(imag(p)-imag(want)) < 1e-4 {
						found = true
					}
				}
				if !found {
					t.Errorf("order 4: no pole near %v in %v", want, poles)
				}
			}
		}
	}
}
