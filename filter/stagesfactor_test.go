package filter

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"

	"pgregory.net/rapid"
)

// sameStages reports whether StagesWith and the frozen reference agree on
// h and opt: the same stages bit for bit, or errors with the same message
// wrapping the same sentinel.
func sameStages(t *rapid.T, h Transfer, opt StageOptions) {
	got, err := h.StagesWith(opt)
	want, wantErr := stagesWithRef(h, opt)
	if (err == nil) != (wantErr == nil) {
		t.Fatalf("%+v %+v: error %v, reference %v", h, opt, err, wantErr)
	}
	if err != nil {
		for _, s := range []error{ErrStage, ErrRange} {
			if errors.Is(err, s) != errors.Is(wantErr, s) {
				t.Fatalf("%+v: error %v, reference %v (sentinel %v)", h, err, wantErr, s)
			}
		}
		if err.Error() != wantErr.Error() {
			t.Fatalf("%+v: error %q, reference %q", h, err, wantErr)
		}
		return
	}
	if len(got) != len(want) {
		t.Fatalf("%+v: %d stages, reference %d", h, len(got), len(want))
	}
	bits := math.Float64bits
	for i := range got {
		g, w := got[i], want[i]
		if g.Kind != w.Kind || g.Order != w.Order || bits(g.F0Hz) != bits(w.F0Hz) || bits(g.Q) != bits(w.Q) ||
			bits(g.ZeroHz) != bits(w.ZeroHz) || bits(g.Gain) != bits(w.Gain) {
			t.Fatalf("%+v %+v: stage %d %+v, reference %+v", h, opt, i, g, w)
		}
	}
}

// genPlan draws a gain plan, now and then an unknown one.
func genPlan(t *rapid.T) StageOptions {
	plan := GainPlan(rapid.IntRange(0, 1).Draw(t, "plan"))
	if rapid.IntRange(0, 30).Draw(t, "badPlan") == 30 {
		plan = GainPlan(rapid.SampledFrom([]int{2, -1}).Draw(t, "unknownPlan"))
	}
	return StageOptions{Gain: plan}
}

// TestStagesFactorMatchesReference: for designs of every family, band and
// order, StagesWith gives the reference's stages bit for bit under both
// plans.
func TestStagesFactorMatchesReference(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		s := genSpec(t)
		f := genFamily(t, s)
		var h Transfer
		var err error
		if rapid.Bool().Draw(t, "fixedOrder") {
			h, err = DesignOrder(f, s, rapid.IntRange(1, 24).Draw(t, "order"))
		} else {
			h, err = Design(f, s)
		}
		if err != nil {
			t.Skip(err)
		}
		sameStages(t, h, StageOptions{Gain: GainLast})
		sameStages(t, h, StageOptions{Gain: GainDynamic})
		// The same roots in another order: pairs no longer side by side.
		sh := Transfer{Gain: h.Gain, Poles: permute(t, h.Poles, "poleOrder"), Zeros: permute(t, h.Zeros, "zeroOrder")}
		sameStages(t, sh, genPlan(t))
	})
}

// permute returns rs in a drawn order (a copy).
func permute(t *rapid.T, rs []complex128, label string) []complex128 {
	out := append([]complex128(nil), rs...)
	for i := len(out) - 1; i > 0; i-- {
		j := rapid.IntRange(0, i).Draw(t, label)
		out[i], out[j] = out[j], out[i]
	}
	return out
}

// genMag draws a magnitude: usually moderate, sometimes from a few values
// (so that repeats and ties occur), sometimes near the ends of the range.
func genMag(t *rapid.T, label string) float64 {
	switch rapid.IntRange(0, 5).Draw(t, label+"Kind") {
	case 0, 1:
		return math.Exp(rapid.Float64Range(math.Log(1e-3), math.Log(1e6)).Draw(t, label))
	case 2:
		return rapid.SampledFrom([]float64{1, 2, 3, 1000, 1e3 * (1 + 1e-12), 1e3 * (1 + 1e-10), 2 * math.Pi * 1e3}).Draw(t, label)
	case 3:
		return math.Exp(rapid.Float64Range(math.Log(1e-300), math.Log(1e300)).Draw(t, label))
	case 4:
		return rapid.SampledFrom([]float64{1e-310, 5e-324, 1e308, math.MaxFloat64, math.MaxFloat64 / 2}).Draw(t, label)
	default:
		return math.Exp(rapid.Float64Range(-2, 2).Draw(t, label))
	}
}

// perturb returns v moved, with probability 1/4, by the relative amount
// rel (drawn once per transfer: below, near or above the pairing
// tolerance).
func perturb(t *rapid.T, v complex128, rel float64, label string) complex128 {
	if rel == 0 || rapid.IntRange(0, 3).Draw(t, label) > 0 {
		return v
	}
	m := cmplx.Abs(v)
	a := rapid.Float64Range(0, 2*math.Pi).Draw(t, label+"Angle")
	return v + complex(rel*m*math.Cos(a), rel*m*math.Sin(a))
}

// TestStagesFactorRandomRoots: on random pole and zero sets (real,
// complex and repeated poles, zeros at and near the origin and on the jω
// axis, near and non-conjugate roots, bad roots that must fail),
// StagesWith agrees with the reference bit for bit, errors included.
func TestStagesFactorRandomRoots(t *testing.T) {
	rapid.Check(t, randomRootsCheck)
}

// randomRootsCheck is the body of TestStagesFactorRandomRoots.
func randomRootsCheck(t *rapid.T) {
	{
		var poles, zeros []complex128
		// Error injections are rare per transfer, so that most transfers
		// reach the pairing and the zero assignment.
		bad := rapid.IntRange(0, 5).Draw(t, "bad") == 5
		rel := 0.0
		if rapid.IntRange(0, 2).Draw(t, "noisy") == 2 {
			rel = rapid.SampledFrom([]float64{1e-15, 1e-12, 1e-10, 5e-10, 1e-9, 2e-9, 1e-6}).Draw(t, "rel")
		}
		nPairs := rapid.IntRange(0, 12).Draw(t, "pairs")
		for i := range nPairs {
			m := genMag(t, "poleMag")
			q := rapid.SampledFrom([]float64{0.5, 0.7071, 1, 3, 30, 0.3, 1e6}).Draw(t, "q")
			if rapid.Bool().Draw(t, "drawnQ") {
				q = math.Exp(rapid.Float64Range(math.Log(0.51), math.Log(100)).Draw(t, "qv"))
			}
			re := -m / (2 * q)
			im := m * math.Sqrt(max(0, 1-1/(4*q*q)))
			p := complex(re, im)
			if bad && rapid.IntRange(0, 3).Draw(t, "badPole") == 0 {
				p = complex(-re*rapid.SampledFrom([]float64{0, 1}).Draw(t, "rhp"), im)
			}
			pc := perturb(t, cmplx.Conj(p), rel, "poleConj")
			if bad && rapid.IntRange(0, 3).Draw(t, "dropConj") == 0 {
				pc = complex(real(pc), -imag(pc))
			}
			poles = append(poles, p, pc)
			if i > 0 && rapid.IntRange(0, 4).Draw(t, "repeatPair") == 0 {
				poles = append(poles, poles[len(poles)-4], poles[len(poles)-3])
			}
		}
		nReal := rapid.IntRange(0, 7).Draw(t, "reals")
		for range nReal {
			r := complex(-genMag(t, "realMag"), 0)
			switch rapid.IntRange(0, 6).Draw(t, "realKind") {
			case 0:
				if len(poles) > 0 && imag(poles[len(poles)-1]) == 0 {
					r = poles[len(poles)-1] // a repeated real pole
				}
			case 1:
				r = complex(real(r), real(r)*rapid.SampledFrom([]float64{1e-12, -1e-10, 1e-8}).Draw(t, "tinyIm"))
			case 2:
				r = complex(real(r), math.Copysign(0, -1))
			}
			poles = append(poles, r)
		}
		if len(poles) > 0 && rapid.Bool().Draw(t, "shufflePoles") {
			poles = permute(t, poles, "poleOrder")
		}
		minPole := math.Inf(1)
		for _, p := range poles {
			minPole = math.Min(minPole, cmplx.Abs(p))
		}
		if math.IsInf(minPole, 1) {
			minPole = 1
		}
		nZ := rapid.IntRange(0, len(poles)+1).Draw(t, "zeros")
		for len(zeros) < nZ {
			switch rapid.IntRange(0, 9).Draw(t, "zeroKind") {
			case 0, 1, 2:
				zeros = append(zeros, 0)
			case 3:
				tiny := minPole * rapid.SampledFrom([]float64{1e-13, 1e-12, 1e-12 * (1 + 1e-11), 1e-12 * (1 + 1e-10), 2e-12, 1e-11}).Draw(t, "tinyZero")
				zeros = append(zeros, complex(0, tiny), complex(tiny, 0))
			case 4:
				zeros = append(zeros, complex(math.Copysign(0, -1), 0))
			case 9:
				if !bad {
					continue
				}
				zeros = append(zeros, complex(-genMag(t, "offAxis"), genMag(t, "offAxisIm")))
			default:
				w := genMag(t, "zeroMag")
				if len(zeros) >= 2 && rapid.IntRange(0, 3).Draw(t, "repeatZero") == 0 {
					w = math.Abs(imag(zeros[len(zeros)-2]))
				}
				z := complex(0, w)
				if rapid.IntRange(0, 5).Draw(t, "offReal") == 0 && (bad || rel > 0) {
					z = complex(w*rapid.SampledFrom([]float64{1e-12, -1e-10, 1e-8}).Draw(t, "zeroRe"), w)
				}
				zeros = append(zeros, z, perturb(t, cmplx.Conj(z), rel, "zeroConj"))
			}
		}
		if len(zeros) > 0 && rapid.Bool().Draw(t, "shuffleZeros") {
			zeros = permute(t, zeros, "zeroOrder")
		}
		gain := rapid.SampledFrom([]float64{1, -1, 1e-300, 1e300, 42.5, -3e-5}).Draw(t, "gain")
		if bad && rapid.Bool().Draw(t, "zeroGain") {
			gain = 0
		}
		sameStages(t, Transfer{Zeros: zeros, Poles: poles, Gain: gain}, genPlan(t))
	}
}

// TestStagesGainLastAllocs: StagesWith allocates only the returned stages.
func TestStagesGainLastAllocs(t *testing.T) {
	for _, c := range []struct {
		f Family
		s Spec
	}{{Elliptic{}, perfLowpass}, {Chebyshev{}, perfBandpass}} {
		h, err := Design(c.f, c.s)
		if err != nil {
			t.Fatal(err)
		}
		if n := testing.AllocsPerRun(100, func() {
			if _, err := h.StagesWith(StageOptions{Gain: GainLast}); err != nil {
				t.Fatal(err)
			}
		}); n != 1 {
			t.Errorf("%T: %v allocations, want 1 (the stages)", c.f, n)
		}
	}
}

// BenchmarkStagesFactorRef times the frozen reference beside StagesWith
// (GainLast), for a comparison in one run.
func BenchmarkStagesFactorRef(b *testing.B) {
	for _, c := range []struct {
		name string
		f    Family
		s    Spec
	}{{"EllipticLowpass", Elliptic{}, perfLowpass}, {"ChebyshevBandpass", Chebyshev{}, perfBandpass}} {
		h, err := Design(c.f, c.s)
		if err != nil {
			b.Fatal(err)
		}
		opt := StageOptions{Gain: GainLast}
		b.Run(c.name+"/Ref", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := stagesWithRef(h, opt); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(c.name+"/New", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := h.StagesWith(opt); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
