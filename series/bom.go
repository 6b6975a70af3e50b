package series

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/rolloff/rolloff/topology"
)

// PartKind is the kind of a passive part, read from the first letter of its
// designator.
type PartKind int

// The part kinds. The zero value is not a valid kind.
const (
	Resistor PartKind = iota + 1
	Capacitor
)

// String returns "resistor" or "capacitor", or "PartKind(n)".
func (k PartKind) String() string {
	switch k {
	case Resistor:
		return "resistor"
	case Capacitor:
		return "capacitor"
	}
	return "PartKind(" + strconv.Itoa(int(k)) + ")"
}

// unit returns the symbol of the kind's unit, "Ω" or "F".
func (k PartKind) unit() string {
	if k == Capacitor {
		return "F"
	}
	return "Ω"
}

// KindOf returns the kind of the part with designator ref: Resistor for
// "R...", Capacitor for "C..." (a stage prefix "U1." is skipped). Any other
// designator is an error wrapping ErrChain.
func KindOf(ref string) (PartKind, error) {
	r := ref
	if i := strings.LastIndexByte(r, '.'); i >= 0 {
		r = r[i+1:]
	}
	switch {
	case strings.HasPrefix(r, "R"):
		return Resistor, nil
	case strings.HasPrefix(r, "C"):
		return Capacitor, nil
	}
	return 0, fmt.Errorf("series: part %q is neither a resistor (R...) nor a capacitor (C...): %w", ref, ErrChain)
}

// Designator returns the chain-unique designator of part ref of the stage
// at index stage (counted from 0 at the chain's input): "U1.R1" for the
// first stage's R1. U<n> is the n-th stage, its op-amp circuit; the SPICE
// deck topology writes names the same part "R1_s1".
func Designator(stage int, ref string) string {
	return "U" + strconv.Itoa(stage+1) + "." + ref
}

// Item is one physical part to buy and place: its chain-unique designator,
// kind, value (ohms or farads), the series the value belongs to (the zero
// Series for a value on no series) and its tolerance as a fraction.
type Item struct {
	Ref       string
	Kind      PartKind
	Value     float64
	Series    Series
	Tolerance float64
}

// Line is one line of a bill of materials: Count parts of one kind, value
// and series, with their designators in chain order.
type Line struct {
	Kind      PartKind
	Value     float64
	Series    Series
	Tolerance float64
	Count     int
	Refs      []string
}

// seriesOf returns prefer if v is one of its values, else the coarsest
// series of IEC 60063 holding v, else the zero Series.
func seriesOf(v float64, prefer Series) Series {
	if isValue(prefer, v) {
		return prefer
	}
	for _, s := range allSeries {
		if isValue(s, v) {
			return s
		}
	}
	return Series{}
}

func isValue(s Series, v float64) bool {
	if !s.valid() || !(v > 0) || math.IsInf(v, 0) {
		return false
	}
	_, member := s.tab().position(v)
	return member
}

// Tolerances gives the tolerance of parts as fractions (0.01 for ±1 %).
// A zero Resistor or Capacitor means "the customary tolerance of the part's
// series" unless Override is set, which takes them as given (0: exact
// parts); Part overrides both for single parts, keyed by chain designator
// ("U2.C1").
type Tolerances struct {
	Resistor, Capacitor float64
	Override            bool
	Part                map[string]float64
}

func (t Tolerances) of(it Item) float64 {
	if x, ok := t.Part[it.Ref]; ok {
		return x
	}
	switch {
	case it.Kind == Resistor && (t.Resistor > 0 || t.Override):
		return t.Resistor
	case it.Kind == Capacitor && (t.Capacitor > 0 || t.Override):
		return t.Capacitor
	}
	if it.Series.valid() {
		return it.Series.Tolerance()
	}
	return 0
}

func (t Tolerances) validate() error {
	bad := func(what string, x float64) error {
		return fmt.Errorf("series: tolerance %s = %g (want a fraction in [0, 1)): %w", what, x, ErrPolicy)
	}
	ok := func(x float64) bool { return x >= 0 && x < 1 }
	if !ok(t.Resistor) {
		return bad("Resistor", t.Resistor)
	}
	if !ok(t.Capacitor) {
		return bad("Capacitor", t.Capacitor)
	}
	for _, k := range sortedKeys(t.Part) {
		if !ok(t.Part[k]) {
			return bad("of "+k, t.Part[k])
		}
	}
	return nil
}

func sortedKeys(m map[string]float64) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

// Items lists the parts of chain as Items, with chain-unique designators
// (see Designator), in chain order. Each value's series is res (for
// resistors) or cap (for capacitors) when the value is one of theirs, else
// the coarsest IEC 60063 series holding it, else none; tolerances come from
// tol.
// A part whose designator is neither R nor C, or whose value is not
// positive and finite, is an error wrapping ErrChain.
func Items(chain topology.Chain, res, cap Series, tol Tolerances) ([]Item, error) {
	if err := tol.validate(); err != nil {
		return nil, err
	}
	var out []Item
	for i, c := range chain.Circuits {
		for _, p := range c.Parts {
			kind, err := KindOf(p.Ref)
			if err != nil {
				return nil, err
			}
			if !(p.Value > 0) || math.IsInf(p.Value, 0) {
				return nil, fmt.Errorf("series: part %s = %g (want positive and finite): %w",
					Designator(i, p.Ref), p.Value, ErrChain)
			}
			pref := res
			if kind == Capacitor {
				pref = cap
			}
			it := Item{Ref: Designator(i, p.Ref), Kind: kind, Value: p.Value, Series: seriesOf(p.Value, pref)}
			it.Tolerance = tol.of(it)
			out = append(out, it)
		}
	}
	return out, nil
}

// BOM groups items into bill-of-materials lines: items of the same kind,
// value, series and tolerance make one line, counted, with their
// designators in the order given. Lines are sorted by kind (resistors
// first), then value, then series, then tolerance, so the same items give
// the same lines in the same order.
func BOM(items []Item) []Line {
	type key struct {
		k   PartKind
		v   float64
		s   Series
		tol float64
	}
	idx := map[key]int{}
	var lines []Line
	for _, it := range items {
		k := key{it.Kind, it.Value, it.Series, it.Tolerance}
		i, ok := idx[k]
		if !ok {
			i = len(lines)
			idx[k] = i
			lines = append(lines, Line{Kind: it.Kind, Value: it.Value, Series: it.Series, Tolerance: it.Tolerance})
		}
		lines[i].Count++
		lines[i].Refs = append(lines[i].Refs, it.Ref)
	}
	sort.SliceStable(lines, func(a, b int) bool {
		la, lb := lines[a], lines[b]
		switch {
		case la.Kind != lb.Kind:
			return la.Kind < lb.Kind
		case la.Value != lb.Value:
			return la.Value < lb.Value
		case la.Series != lb.Series:
			return la.Series.id < lb.Series.id
		}
		return la.Tolerance < lb.Tolerance
	})
	return lines
}

// CSVHeader is the header row WriteCSV writes; the columns and their order
// are stable:
//
//	kind       "resistor" or "capacitor"
//	value      the value in ohms or farads, shortest exact decimal ("4700")
//	display    the value in engineering notation with its unit ("4.7 kΩ")
//	code       the IEC 60062 letter-and-digit code ("4K7")
//	series     "E24", or "" for a value on no series
//	tolerance  the tolerance in percent ("1", "0.5")
//	count      the number of parts
//	refs       the designators, comma-separated ("U1.R1, U2.R3")
var CSVHeader = []string{"kind", "value", "display", "code", "series", "tolerance", "count", "refs"}

// WriteCSV writes lines as CSV (encoding/csv, RFC 4180), a CSVHeader row
// first, in the order given (BOM's order is deterministic). The value column
// reads back exactly; display and code use 3 significant figures, or as many
// more as the value needs to be shown exactly ("1.234 kΩ").
func WriteCSV(w io.Writer, lines []Line) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(CSVHeader); err != nil {
		return fmt.Errorf("series: write CSV: %w", err)
	}
	for _, l := range lines {
		f := Format{}
		for d := 3; d <= 17; d++ {
			f.Digits = d
			if rounded(l.Value, d) == l.Value {
				break
			}
		}
		name := ""
		if l.Series.valid() {
			name = l.Series.String()
		}
		rec := []string{
			l.Kind.String(),
			strconv.FormatFloat(l.Value, 'g', -1, 64),
			f.Value(l.Value, l.Kind.unit()),
			f.Code(l.Value),
			name,
			strconv.FormatFloat(l.Tolerance*100, 'g', 6, 64),
			strconv.Itoa(l.Count),
			strings.Join(l.Refs, ", "),
		}
		if err := cw.Write(rec); err != nil {
			return fmt.Errorf("series: write CSV: %w", err)
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("series: write CSV: %w", err)
	}
	return nil
}

// rounded returns v rounded to n significant figures (the float64 nearest
// to that decimal).
func rounded(v float64, n int) float64 {
	x, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'e', n-1, 64), 64)
	return x
}
