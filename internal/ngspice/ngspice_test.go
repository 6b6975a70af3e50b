package ngspice

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"
)

// rcDeck is a first-order RC lowpass, 1 kΩ and 1 µF: corner 1/(2π·1e-3) Hz.
const rcDeck = `rc lowpass check
VIN in 0 AC 1
R1 in out 1k
C1 out 0 1u
.end
`

// TestACMatchesClosedForm compares ngspice's AC sweep of an RC lowpass with
// H = 1/(1 + jωRC) (closed form of the voltage divider).
func TestACMatchesClosedForm(t *testing.T) {
	Required(t)
	sw, err := AC(rcDeck, "out", 10, 1, 1e5)
	if err != nil {
		t.Fatal(err)
	}
	if len(sw.Hz) != 51 {
		t.Fatalf("got %d points, want 51", len(sw.Hz))
	}
	for i, f := range sw.Hz {
		h := 1 / complex(1, 2*math.Pi*f*1e-3)
		db := 20 * math.Log10(cmplx.Abs(h))
		ph := cmplx.Phase(h) * 180 / math.Pi
		// 12 significant digits are printed; 1e-8 dB is far above that.
		if math.Abs(sw.GainDB[i]-db) > 1e-8 || math.Abs(sw.PhaseDeg[i]-ph) > 1e-8 {
			t.Errorf("%g Hz: ngspice %g dB %g°, closed form %g dB %g°", f, sw.GainDB[i], sw.PhaseDeg[i], db, ph)
		}
	}
}

func TestRunControlAlter(t *testing.T) {
	Required(t)
	out, err := RunControl(rcDeck, "ac dec 20 1 1e5\nmeas ac fa when vdb(out)=-3.0103\nalter R1 = 2k\nac dec 20 1 1e5\nmeas ac fb when vdb(out)=-3.0103")
	if err != nil {
		t.Fatal(err)
	}
	vs := Values(out)
	got := map[string]float64{}
	for _, v := range vs {
		got[v.Name] = v.Value
	}
	// -3.0103 dB is |H| = 1/√2 to 5 digits: f = 1/(2πRC).
	for name, want := range map[string]float64{"fa": 1 / (2 * math.Pi * 1e-3), "fb": 1 / (2 * math.Pi * 2e-3)} {
		if g, ok := got[name]; !ok || math.Abs(g-want)/want > 1e-4 {
			t.Errorf("%s = %g (present %v), want %g; output:\n%s", name, g, ok, want, out)
		}
	}
}

func TestBadRequests(t *testing.T) {
	tests := []struct {
		reason string
		deck   string
		node   string
		n      int
		f1, f2 float64
		want   error
	}{
		{"no .end", "t\nR1 a 0 1\n", "a", 10, 1, 10, ErrDeck},
		{"only .end", ".end\n", "a", 10, 1, 10, ErrDeck},
		{"own control", "t\n.control\nquit\n.endc\n.end\n", "a", 10, 1, 10, ErrDeck},
		{"bad node", rcDeck, "v(out)", 10, 1, 10, ErrDeck},
		{"zero per decade", rcDeck, "out", 0, 1, 10, ErrDeck},
		{"f1 zero", rcDeck, "out", 10, 0, 10, ErrDeck},
		{"f2 < f1", rcDeck, "out", 10, 10, 1, ErrDeck},
		{"NaN", rcDeck, "out", 10, math.NaN(), 1, ErrDeck},
	}
	for _, tc := range tests {
		_, err := AC(tc.deck, tc.node, tc.n, tc.f1, tc.f2)
		if !errors.Is(err, tc.want) {
			t.Errorf("%s: err = %v, want %v", tc.reason, err, tc.want)
		}
	}
}

func TestRunFailure(t *testing.T) {
	Required(t)
	// A node name that the deck does not have makes wrdata fail to write.
	_, err := AC(rcDeck, "nosuch", 10, 1, 10)
	if !errors.Is(err, ErrRun) {
		t.Errorf("err = %v, want ErrRun", err)
	}
}

func TestValues(t *testing.T) {
	out := "No. of Data Rows : 16\ng[3] = -2.63572e-01\nf3                  =  1.587884e+02\nmean(vdb(out)) = -1.55857e+01\nx = y\n"
	got := Values(out)
	want := []Value{{"g[3]", -0.263572}, {"f3", 158.7884}, {"mean(vdb(out))", -15.5857}}
	if len(got) != len(want) {
		t.Fatalf("got %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("got %v, want %v", got[i], want[i])
		}
	}
}
