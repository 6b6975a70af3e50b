package series

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"pgregory.net/rapid"
)

func TestParseValue(t *testing.T) {
	tests := []struct {
		in   string
		want float64
	}{
		// Engineering notation.
		{"15.8k", 15.8e3},
		{"100n", 100e-9},
		{"4.7 µF", 4.7e-6},
		{"4.7 μF", 4.7e-6}, // Greek mu
		{"4.7uF", 4.7e-6},
		{"1M", 1e6},
		{"1 MΩ", 1e6},
		{"2.2 kΩ", 2.2e3},
		{"2.2 kΩ", 2.2e3}, // ohm sign U+2126
		{"2.2kohm", 2.2e3},
		{"10 Ohm", 10},
		{"1e-9", 1e-9},
		{"1E+3", 1e3},
		{"0.1u", 0.1e-6},
		{".5", 0.5},
		{"5.", 5},
		{"100R", 100},
		{"1mF", 1e-3},
		{"1F", 1},
		{"3.3 fF", 3.3e-15},
		{"12.5 kHz", 12.5e3},
		{"10 mH", 10e-3},
		{"4.7K", 4.7e3},
		{"  22p  ", 22e-12},
		{"-1.5k", -1.5e3},
		{"+2G", 2e9},
		{"1T", 1e12},
		{"0", 0},
		{"0R", 0},
		// IEC 60062 letter-and-digit code (from memory of IEC 60062).
		{"4k7", 4.7e3},
		{"4K7", 4.7e3},
		{"2R2", 2.2},
		{"R47", 0.47},
		{"1M0", 1e6},
		{"4n7", 4.7e-9},
		{"p68", 0.68e-12},
		{"6p8", 6.8e-12},
		{"1µ5", 1.5e-6},
		{"2u2F", 2.2e-6},
		{"15K8", 15.8e3},
		{"0R1", 0.1},
		{"3G3", 3.3e9},
		// A lowercase f after a prefix is farads (common practice in
		// hand-written part lists); alone it is femto.
		{"100nf", 100e-9},
		{"4.7uf", 4.7e-6},
		{"4n7f", 4.7e-9},
		{"22f", 22e-15},
		{"1ff", 1e-15}, // femto, then farads
	}
	for _, tc := range tests {
		got, err := ParseValue(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("ParseValue(%q) = %v, %v; want %v exactly", tc.in, got, err, tc.want)
		}
	}
}

func TestParseValueErrors(t *testing.T) {
	tests := []struct {
		in  string
		err error
	}{
		{"", ErrSyntax}, {"   ", ErrSyntax}, {"k", ErrSyntax}, {"R", ErrSyntax},
		{"abc", ErrSyntax}, {"4.7k7", ErrSyntax}, {"4k7k", ErrSyntax}, {"1e", ErrSyntax},
		{"1e+", ErrSyntax}, {"e5", ErrSyntax}, {"1..2", ErrSyntax}, {"1.2.3", ErrSyntax},
		{"4 k7", ErrSyntax}, {"1kk", ErrSyntax}, {"0x10", ErrSyntax}, {"NaN", ErrSyntax},
		{"Inf", ErrSyntax}, {"-Inf", ErrSyntax}, {"1e3k", ErrSyntax}, {"1 V", ErrSyntax},
		{"--1", ErrSyntax}, {"1 000", ErrSyntax}, {"4.7 µ F", ErrSyntax}, {"1,5k", ErrSyntax},
		{"2R2f", ErrSyntax}, {"1e400", ErrRange}, {"1e-400", ErrRange}, {"1e9999999", ErrRange}, {"999T" + "e300", ErrSyntax},
	}
	for _, tc := range tests {
		v, err := ParseValue(tc.in)
		if !errors.Is(err, tc.err) {
			t.Errorf("ParseValue(%q) = %v, %v; want an error wrapping %v", tc.in, v, err, tc.err)
			continue
		}
		if want := strconv.Quote(tc.in); err != nil && !contains(err.Error(), want) {
			t.Errorf("ParseValue(%q) error %q does not quote the input", tc.in, err)
		}
	}
}

func contains(s, sub string) bool {
	for i := 0; i+len(sub) <= len(s); i++ {
		if s[i:i+len(sub)] == sub {
			return true
		}
	}
	return false
}

func TestFormatValue(t *testing.T) {
	tests := []struct {
		v    float64
		unit string
		want string
	}{
		{15.8e3, "", "15.8k"},
		{15.8e3, "Ω", "15.8 kΩ"},
		{100e-9, "F", "100 nF"},
		{4.7e-6, "F", "4.7 µF"},
		{1e6, "", "1M"},
		{999.7, "", "1k"},
		{1234.5, "", "1.23k"},
		{0.47, "", "470m"},
		{0, "Ω", "0 Ω"},
		{-2.2e3, "", "-2.2k"},
		// Beyond the prefixes: exponent notation, not "1000T" or "0.001f".
		{1e15, "", "1e+15"},
		{1e-18, "", "1e-18"},
		{1e-30, "Ω", "1e-30 Ω"},
		{1e30, "Ω", "1e+30 Ω"},
		{-4.7e-20, "F", "-4.7e-20 F"},
		{999.5e12, "", "1e+15"}, // rounds up out of the T range
		{999.4e12, "", "999T"},
		{1e-15, "F", "1 fF"},
		{0.9996e-15, "F", "1 fF"}, // rounds up into the f range
		{0.9994e-15, "F", "9.99e-16 F"},
		{math.MaxFloat64, "", "1.8e+308"},
		{5e-324, "", "4.94e-324"},
		{math.NaN(), "F", "NaN"},
		{math.Inf(1), "", "+Inf"},
	}
	for _, tc := range tests {
		if got := FormatValue(tc.v, tc.unit); got != tc.want {
			t.Errorf("FormatValue(%g, %q) = %q, want %q", tc.v, tc.unit, got, tc.want)
		}
	}
	if got := (Format{Digits: 5, ASCII: true}).Value(1.23456e-6, "F"); got != "1.2346 uF" {
		t.Errorf("5 digits ASCII: %q", got)
	}
}

func TestFormatCode(t *testing.T) {
	tests := []struct {
		v    float64
		want string
	}{
		{4.7e3, "4K7"}, {2.2, "2R2"}, {0.47, "R47"}, {100e-9, "100n"}, {1e6, "1M0"},
		{4.7e-9, "4n7"}, {0.68e-12, "680f"}, {6.8e-12, "6p8"}, {10e3, "10K"}, {100e3, "100K"},
		{15.8e3, "15K8"}, {1, "1R0"}, {0.1, "R1"}, {0.047, "47m"}, {0, "0R"}, {1.5e-6, "1µ5"},
		{1e-18, "1e-18"}, {2.2e15, "2.2e+15"}, {-4.7e3, "-4K7"},
	}
	for _, tc := range tests {
		if got := FormatCode(tc.v); got != tc.want {
			t.Errorf("FormatCode(%g) = %q, want %q", tc.v, got, tc.want)
		}
	}
	if got := (Format{ASCII: true}).Code(2.2e-6); got != "2u2" {
		t.Errorf("ASCII code: %q", got)
	}
}

// TestRoundTripWide: Value round-trips through ParseValue over the whole
// float64 exponent range, inside the prefixes and beyond them (where it
// falls back to exponent notation), and never prints a number outside
// [1, 1000) before a prefix.
func TestRoundTripWide(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		e := rapid.Float64Range(-323, 308.25).Draw(t, "log10")
		v := math.Pow(10, e)
		if v == 0 || math.IsInf(v, 0) {
			t.Skip("outside float64")
		}
		if rapid.Bool().Draw(t, "negative") {
			v = -v
		}
		f := Format{Digits: rapid.IntRange(1, 17).Draw(t, "digits"), ASCII: rapid.Bool().Draw(t, "ascii")}
		want := rounded(v, f.digits())
		if math.IsInf(want, 0) {
			// 1.78e308 to one figure is 2e308: the printed value is beyond
			// float64, and ParseValue rightly refuses it (ErrRange).
			t.Skip("rounding leaves float64")
		}
		unit := rapid.SampledFrom([]string{"", "Ω", "F", "Hz"}).Draw(t, "unit")
		s := f.Value(v, unit)
		got, err := ParseValue(s)
		if err != nil || got != want {
			t.Fatalf("ParseValue(%q) = %v, %v; want %v (v = %v)", s, got, err, want, v)
		}
		num, _, _ := strings.Cut(strings.TrimPrefix(s, "-"), " ")
		if !strings.ContainsAny(num, "e") {
			// Engineering form: the number before the prefix is in [1, 1000).
			end := strings.IndexFunc(num, func(r rune) bool { return !(r == '.' || r >= '0' && r <= '9') })
			if end >= 0 {
				num = num[:end]
			}
			// Read as a decimal, not as a float64: 17 figures just below
			// 1000 ("999.99999999999995", the float64 next below 1e-6 in
			// nano) are in [1, 1000) but round to 1000 as a float64.
			intPart, _, _ := strings.Cut(num, ".")
			if _, err := strconv.ParseFloat(num, 64); err != nil || len(intPart) < 1 || len(intPart) > 3 || intPart[0] == '0' {
				t.Fatalf("Value(%v) = %q: number %q outside [1, 1000)", v, s, num)
			}
		}
	})
}

// TestRoundTrip: formatting then parsing gives back v rounded to the printed
// figures, bit for bit, in both notations and at every digit count.
func TestRoundTrip(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		e := rapid.Float64Range(-14.9, 14.9).Draw(t, "log10")
		v := math.Pow(10, e)
		if rapid.Bool().Draw(t, "negative") {
			v = -v
		}
		f := Format{Digits: rapid.IntRange(1, 17).Draw(t, "digits"), ASCII: rapid.Bool().Draw(t, "ascii")}
		want := rounded(v, f.digits())
		if math.IsInf(want, 0) {
			// 1.78e308 to one figure is 2e308: the printed value is beyond
			// float64, and ParseValue rightly refuses it (ErrRange).
			t.Skip("rounding leaves float64")
		}
		unit := rapid.SampledFrom([]string{"", "Ω", "F", "Hz"}).Draw(t, "unit")
		for _, s := range []string{f.Value(v, unit), f.Code(v)} {
			got, err := ParseValue(s)
			if err != nil || got != want {
				t.Fatalf("ParseValue(%q) = %v, %v; want %v (v = %v)", s, got, err, want, v)
			}
		}
	})
}

// TestCanonicalExact: every standard value of every series, printed with
// its own significant figures, parses back to exactly the same float64.
func TestCanonicalExact(t *testing.T) {
	for _, s := range All {
		for _, v := range s.Range(1e-13, 1e7) {
			for _, str := range []string{FormatValue(v, ""), FormatCode(v)} {
				got, err := ParseValue(str)
				if err != nil || got != v {
					t.Fatalf("%v: ParseValue(%q) = %v, %v; want %v", s, str, got, err, v)
				}
			}
		}
	}
}

func FuzzParseValue(f *testing.F) {
	for _, s := range []string{"15.8k", "100n", "4.7 µF", "4.7uF", "1M", "2.2 kΩ", "1e-9", "0.1u",
		"4k7", "2R2", "R47", "1M0", "4n7", "p68", "100R", "-1.5e3", "", "k", "1e400", "4.7k7", "1e3k"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := ParseValue(s)
		if err != nil {
			if !errors.Is(err, ErrSyntax) && !errors.Is(err, ErrRange) {
				t.Fatalf("ParseValue(%q) error %v wraps neither ErrSyntax nor ErrRange", s, err)
			}
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("ParseValue(%q) = %v", s, v)
		}
		// 17 figures print any float64 exactly.
		for _, str := range []string{(Format{Digits: 17}).Value(v, "F"), (Format{Digits: 17}).Code(v)} {
			back, err := ParseValue(str)
			if err != nil || back != v {
				t.Fatalf("ParseValue(%q) = %v; formatted %q parses to %v, %v", s, v, str, back, err)
			}
		}
	})
}

func TestNoAllocs(t *testing.T) {
	var sink float64
	if n := testing.AllocsPerRun(100, func() {
		for _, s := range []string{"4k7", "15.8 kΩ", "1e-9", "100nf"} {
			v, _ := ParseValue(s)
			sink += v
		}
	}); n != 0 {
		t.Errorf("ParseValue: %v allocations", n)
	}
	if n := testing.AllocsPerRun(100, func() {
		sink += E96.Nearest(15.83e3) + E12.Below(4.7e3) + E24.Above(1e-9)
	}); n != 0 {
		t.Errorf("Nearest, Below, Above: %v allocations", n)
	}
	_ = sink
}
