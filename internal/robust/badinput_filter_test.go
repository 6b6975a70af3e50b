package robust_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/rolloff/rolloff/filter"
)

// okSpec returns a valid mask of each band, the starting point of the
// spec rows (each row spoils one field).
func okSpec(b filter.Band) filter.Spec {
	switch b {
	case filter.Lowpass:
		return filter.Spec{Band: b, PassHz: [2]float64{1000}, StopHz: [2]float64{4000}, RippleDB: 1, AttenDB: 40}
	case filter.Highpass:
		return filter.Spec{Band: b, PassHz: [2]float64{4000}, StopHz: [2]float64{1000}, RippleDB: 1, AttenDB: 40}
	case filter.Bandpass:
		return filter.Spec{Band: b, PassHz: [2]float64{900, 1100}, StopHz: [2]float64{500, 2000}, RippleDB: 1, AttenDB: 40}
	default:
		return filter.Spec{Band: b, PassHz: [2]float64{500, 2000}, StopHz: [2]float64{900, 1100}, RippleDB: 1, AttenDB: 40}
	}
}

var bands = []filter.Band{filter.Lowpass, filter.Highpass, filter.Bandpass, filter.Bandstop}

// families returns one valid value of every family.
func families() []filter.Family {
	return []filter.Family{filter.Butterworth{}, filter.Chebyshev{RippleDB: 1}, filter.InverseChebyshev{AttenDB: 40},
		filter.Elliptic{RippleDB: 1, AttenDB: 40}, filter.Bessel{}}
}

// maxOrder returns the documented highest order of a family.
func maxOrder(f filter.Family) int {
	switch f.(type) {
	case filter.Butterworth:
		return filter.MaxButterworthOrder
	case filter.Chebyshev, filter.InverseChebyshev:
		return filter.MaxChebyshevOrder
	case filter.Elliptic:
		return filter.MaxEllipticOrder
	}
	return filter.MaxBesselOrder
}

// badSpecs returns, for every band, masks with one bad field each and the
// field the error must name.
func badSpecs() []struct {
	reason, field string
	s             filter.Spec
} {
	type row = struct {
		reason, field string
		s             filter.Spec
	}
	var out []row
	for _, b := range bands {
		n := 1
		if b == filter.Bandpass || b == filter.Bandstop {
			n = 2
		}
		for _, x := range badNumbers {
			for i := range n {
				s := okSpec(b)
				s.PassHz[i] = x.v
				out = append(out, row{fmt.Sprintf("%v PassHz[%d] %s", b, i, x.name), fmt.Sprintf("PassHz[%d]", i), s})
				s = okSpec(b)
				s.StopHz[i] = x.v
				out = append(out, row{fmt.Sprintf("%v StopHz[%d] %s", b, i, x.name), fmt.Sprintf("StopHz[%d]", i), s})
			}
			s := okSpec(b)
			s.RippleDB = x.v
			out = append(out, row{fmt.Sprintf("%v RippleDB %s", b, x.name), "RippleDB", s})
			s = okSpec(b)
			s.AttenDB = x.v
			out = append(out, row{fmt.Sprintf("%v AttenDB %s", b, x.name), "AttenDB", s})
		}
		s := okSpec(b)
		s.RippleDB, s.AttenDB = 40, 40
		out = append(out, row{fmt.Sprintf("%v ripple equal to attenuation", b), "RippleDB", s})
		s.RippleDB, s.AttenDB = 50, 40
		out = append(out, row{fmt.Sprintf("%v ripple above attenuation", b), "RippleDB", s})
		// Edges reversed, equal, or overlapping.
		s = okSpec(b)
		s.PassHz, s.StopHz = s.StopHz, s.PassHz
		out = append(out, row{fmt.Sprintf("%v pass and stop edges swapped", b), "StopHz[0]", s})
		s = okSpec(b)
		s.StopHz[0] = s.PassHz[0]
		out = append(out, row{fmt.Sprintf("%v stop edge equal to pass edge", b), "StopHz[0]", s})
		if n == 2 {
			s = okSpec(b)
			s.PassHz[0], s.PassHz[1] = s.PassHz[1], s.PassHz[0]
			f := "PassHz[1]"
			if b == filter.Bandstop {
				f = "StopHz[0]"
			}
			out = append(out, row{fmt.Sprintf("%v pass edges reversed", b), f, s})
			s = okSpec(b)
			s.StopHz[0], s.StopHz[1] = s.StopHz[1], s.StopHz[0]
			f = "StopHz[0]"
			if b == filter.Bandstop {
				f = "StopHz[1]"
			}
			out = append(out, row{fmt.Sprintf("%v stop edges reversed", b), f, s})
			s = okSpec(b)
			s.StopHz[1] = s.PassHz[1] // upper edges overlap
			f = "StopHz[1]"
			if b == filter.Bandstop {
				f = "PassHz[1]"
			}
			out = append(out, row{fmt.Sprintf("%v upper edges overlapping", b), f, s})
		}
	}
	for _, b := range []filter.Band{0, -1, 5, 99} {
		s := okSpec(filter.Lowpass)
		s.Band = b
		out = append(out, row{fmt.Sprintf("unknown band %d", int(b)), "Band", s})
	}
	return out
}

func filterBadInputs() []badInput {
	var rows []badInput
	// Prototype: orders 0, negative, absurd, just beyond the range.
	for _, f := range families() {
		for _, n := range []int{0, -1, -1e9, math.MinInt, 1e9, math.MaxInt, maxOrder(f) + 1} {
			rows = append(rows, badInput{fmt.Sprintf("%v.Prototype(%d)", f, n), errs(filter.ErrOrder), "order",
				func() error { _, err := f.Prototype(n); return err }})
		}
	}
	// Prototype: bad family parameters.
	for _, x := range badNumbers {
		for _, c := range []struct {
			f     filter.Family
			field string
		}{
			{filter.Chebyshev{RippleDB: x.v}, "RippleDB"},
			{filter.InverseChebyshev{AttenDB: x.v}, "AttenDB"},
			{filter.Elliptic{RippleDB: x.v, AttenDB: 40}, "RippleDB"},
			{filter.Elliptic{RippleDB: 1, AttenDB: x.v}, "AttenDB"},
		} {
			rows = append(rows, badInput{fmt.Sprintf("%#v.Prototype(4): %s", c.f, x.name), errs(filter.ErrParam), c.field,
				func() error { _, err := c.f.Prototype(4); return err }})
		}
	}
	for _, c := range []struct {
		reason string
		f      filter.Family
		field  string
	}{
		{"elliptic ripple equal to attenuation", filter.Elliptic{RippleDB: 3, AttenDB: 3}, "AttenDB"},
		{"elliptic ripple above attenuation", filter.Elliptic{RippleDB: 30, AttenDB: 3}, "AttenDB"},
		{"unknown Bessel norm 3", filter.Bessel{Norm: 3}, "Norm"},
		{"unknown Bessel norm -1", filter.Bessel{Norm: -1}, "Norm"},
	} {
		rows = append(rows, badInput{c.reason, errs(filter.ErrParam), c.field,
			func() error { _, err := c.f.Prototype(4); return err }})
	}
	// Spec.Validate, MinOrder and Design on every bad mask, every family.
	for _, c := range badSpecs() {
		rows = append(rows, badInput{"Validate: " + c.reason, errs(filter.ErrSpec), c.field, c.s.Validate})
		for _, f := range families() {
			rows = append(rows,
				badInput{fmt.Sprintf("MinOrder %v: %s", f, c.reason), errs(filter.ErrSpec), c.field,
					func() error { _, err := filter.MinOrder(f, c.s); return err }},
				badInput{fmt.Sprintf("Design %v: %s", f, c.reason), errs(filter.ErrSpec), c.field,
					func() error { _, err := filter.Design(f, c.s); return err }})
		}
	}
	// DesignOrder: bad orders for every family and band, bad masks.
	for _, f := range families() {
		for _, b := range bands {
			for _, n := range []int{0, -1, math.MinInt, 1e9, math.MaxInt, maxOrder(f) + 1} {
				rows = append(rows, badInput{fmt.Sprintf("DesignOrder %v %v order %d", f, b, n), errs(filter.ErrOrder), "order",
					func() error { _, err := filter.DesignOrder(f, okSpec(b), n); return err }})
			}
		}
	}
	for _, c := range badSpecs() {
		rows = append(rows, badInput{"DesignOrder: " + c.reason, errs(filter.ErrSpec), c.field,
			func() error { _, err := filter.DesignOrder(filter.Butterworth{}, c.s, 4); return err }})
	}
	rows = append(rows,
		badInput{"DesignOrder nil family", errs(filter.ErrParam), "Family", func() error { _, err := filter.DesignOrder(nil, okSpec(filter.Lowpass), 4); return err }},
		badInput{"DesignOrder looser ripple", errs(filter.ErrParam), "RippleDB", func() error {
			_, err := filter.DesignOrder(filter.Chebyshev{RippleDB: 3}, okSpec(filter.Lowpass), 4)
			return err
		}})
	// Design: family parameters bad or looser than the mask's; nil family;
	// a mask that needs an order beyond the range.
	lp := okSpec(filter.Lowpass)
	for _, c := range []struct {
		reason string
		f      filter.Family
		field  string
		want   []error
	}{
		{"nil family", nil, "Family", errs(filter.ErrParam)},
		{"nil *Butterworth family", (*filter.Butterworth)(nil), "Family", errs(filter.ErrParam)},
		{"Chebyshev ripple looser than the mask", filter.Chebyshev{RippleDB: 2}, "RippleDB", errs(filter.ErrParam)},
		{"Chebyshev ripple negative", filter.Chebyshev{RippleDB: -1}, "RippleDB", errs(filter.ErrParam)},
		{"Chebyshev ripple NaN", filter.Chebyshev{RippleDB: nan}, "RippleDB", errs(filter.ErrParam)},
		{"inverse Chebyshev attenuation looser than the mask", filter.InverseChebyshev{AttenDB: 20}, "AttenDB", errs(filter.ErrParam)},
		{"inverse Chebyshev attenuation +Inf", filter.InverseChebyshev{AttenDB: inf}, "AttenDB", errs(filter.ErrParam)},
		{"elliptic ripple looser", filter.Elliptic{RippleDB: 3}, "RippleDB", errs(filter.ErrParam)},
		{"elliptic attenuation looser", filter.Elliptic{AttenDB: 30}, "AttenDB", errs(filter.ErrParam)},
		{"Bessel unknown norm", filter.Bessel{Norm: 7}, "Norm", errs(filter.ErrParam)},
	} {
		rows = append(rows,
			badInput{"MinOrder: " + c.reason, c.want, c.field, func() error { _, err := filter.MinOrder(c.f, lp); return err }},
			badInput{"Design: " + c.reason, c.want, c.field, func() error { _, err := filter.Design(c.f, lp); return err }})
	}
	// Families defined outside the package that misbehave.
	for _, c := range []struct {
		reason, field string
		f             filter.Family
		want          []error
	}{
		{"outside family failing in its own words", "Prototype(1)", outsideFamily{err: errors.New("no table")}, errs(filter.ErrParam)},
		{"outside family with a NaN pole", "Poles[0]", outsideFamily{h: filter.Transfer{Poles: []complex128{complex(nan, 0)}, Gain: 1}}, errs(filter.ErrParam)},
		{"outside family with an unstable pole", "Poles[0]", outsideFamily{h: filter.Transfer{Poles: []complex128{1}, Gain: 1}}, errs(filter.ErrParam)},
		{"outside family with a pole on the jω axis", "Poles[1]", outsideFamily{h: filter.Transfer{Poles: []complex128{-1, complex(0, 2)}, Gain: 1}}, errs(filter.ErrParam)},
		{"outside family with no poles", "order", outsideFamily{h: filter.Transfer{Gain: 1}}, errs(filter.ErrRange)},
		{"outside family of zero gain", "order", outsideFamily{h: filter.Transfer{Poles: []complex128{-1}}}, errs(filter.ErrRange)},
	} {
		for _, b := range bands {
			rows = append(rows, badInput{fmt.Sprintf("Design %v: %s", b, c.reason), c.want, c.field,
				func() error { _, err := filter.Design(c.f, okSpec(b)); return err }})
		}
	}
	tight := filter.Spec{Band: filter.Lowpass, PassHz: [2]float64{1000}, StopHz: [2]float64{1000.01}, RippleDB: 0.01, AttenDB: 200}
	for _, f := range families() {
		if e, ok := f.(filter.Elliptic); ok {
			e.AttenDB, e.RippleDB = 0, 0
			f = e
		}
		if _, ok := f.(filter.Chebyshev); ok {
			f = filter.Chebyshev{}
		}
		if _, ok := f.(filter.InverseChebyshev); ok {
			f = filter.InverseChebyshev{}
		}
		for _, b := range bands {
			s := tight
			s.Band = b
			switch b {
			case filter.Highpass:
				s.PassHz[0], s.StopHz[0] = 1000.01, 1000
			case filter.Bandpass:
				s.PassHz, s.StopHz = [2]float64{1000, 1100}, [2]float64{999.99, 1100.01}
			case filter.Bandstop:
				s.PassHz, s.StopHz = [2]float64{999.99, 1100.01}, [2]float64{1000, 1100}
			}
			rows = append(rows,
				badInput{fmt.Sprintf("MinOrder %v %v: order beyond the range", f, b), errs(filter.ErrRange), "order",
					func() error { _, err := filter.MinOrder(f, s); return err }},
				badInput{fmt.Sprintf("Design %v %v: order beyond the range", f, b), errs(filter.ErrRange), "order",
					func() error { _, err := filter.Design(f, s); return err }})
		}
	}
	// Transforms: bad corner, centre, width; a transfer holding NaN or Inf.
	h, _ := filter.Butterworth{}.Prototype(3)
	for _, x := range badNumbers {
		rows = append(rows,
			badInput{"ToLowpass cornerHz " + x.name, errs(filter.ErrFrequency), "cornerHz", func() error { _, err := h.ToLowpass(x.v); return err }},
			badInput{"ToHighpass cornerHz " + x.name, errs(filter.ErrFrequency), "cornerHz", func() error { _, err := h.ToHighpass(x.v); return err }},
			badInput{"ToBandpass centerHz " + x.name, errs(filter.ErrFrequency), "centerHz", func() error { _, err := h.ToBandpass(x.v, 100); return err }},
			badInput{"ToBandpass widthHz " + x.name, errs(filter.ErrFrequency), "widthHz", func() error { _, err := h.ToBandpass(1000, x.v); return err }},
			badInput{"ToBandstop centerHz " + x.name, errs(filter.ErrFrequency), "centerHz", func() error { _, err := h.ToBandstop(x.v, 100); return err }},
			badInput{"ToBandstop widthHz " + x.name, errs(filter.ErrFrequency), "widthHz", func() error { _, err := h.ToBandstop(1000, x.v); return err }},
		)
	}
	for _, c := range []struct {
		reason, field string
		h             filter.Transfer
	}{
		{"NaN gain", "Gain", filter.Transfer{Poles: []complex128{-1}, Gain: nan}},
		{"infinite gain", "Gain", filter.Transfer{Poles: []complex128{-1}, Gain: inf}},
		{"NaN pole", "Poles[0]", filter.Transfer{Poles: []complex128{complex(nan, 0)}, Gain: 1}},
		{"infinite zero", "Zeros[0]", filter.Transfer{Zeros: []complex128{complex(0, inf)}, Poles: []complex128{-1, -2}, Gain: 1}},
	} {
		rows = append(rows,
			badInput{"ToLowpass: " + c.reason, errs(filter.ErrRange), c.field, func() error { _, err := c.h.ToLowpass(1000); return err }},
			badInput{"ToHighpass: " + c.reason, errs(filter.ErrRange), c.field, func() error { _, err := c.h.ToHighpass(1000); return err }},
			badInput{"ToBandpass: " + c.reason, errs(filter.ErrRange), c.field, func() error { _, err := c.h.ToBandpass(1000, 100); return err }},
			badInput{"ToBandstop: " + c.reason, errs(filter.ErrRange), c.field, func() error { _, err := c.h.ToBandstop(1000, 100); return err }},
		)
	}
	h64, _ := filter.Butterworth{}.Prototype(64)
	rows = append(rows,
		badInput{"ToLowpass gain overflows at order 64, 1 THz", errs(filter.ErrRange), "gain", func() error { _, err := h64.ToLowpass(1e12); return err }},
		badInput{"ToBandpass centre too high for float64", errs(filter.ErrRange), "centerHz", func() error { _, err := h.ToBandpass(1e300, 1e299); return err }})
	// Stages: transfers that no cascade represents.
	for _, c := range []struct {
		reason, field string
		h             filter.Transfer
		want          error
	}{
		{"no poles", "poles", filter.Transfer{Gain: 1}, filter.ErrStage},
		{"zero gain", "Gain", filter.Transfer{Poles: []complex128{-1}}, filter.ErrStage},
		{"NaN gain", "Gain", filter.Transfer{Poles: []complex128{-1}, Gain: nan}, filter.ErrRange},
		{"right half-plane pole", "pole", filter.Transfer{Poles: []complex128{1}, Gain: 1}, filter.ErrStage},
		{"pole on the jω axis", "pole", filter.Transfer{Poles: []complex128{1i, -1i}, Gain: 1}, filter.ErrStage},
		{"NaN pole", "Poles[0]", filter.Transfer{Poles: []complex128{complex(nan, 1)}, Gain: 1}, filter.ErrRange},
		{"unpaired complex pole", "conjugate", filter.Transfer{Poles: []complex128{complex(-1, 1)}, Gain: 1}, filter.ErrStage},
		{"zero off the jω axis", "zero", filter.Transfer{Zeros: []complex128{-3}, Poles: []complex128{complex(-1, 1), complex(-1, -1)}, Gain: 1}, filter.ErrStage},
		{"unpaired jω zero", "conjugate", filter.Transfer{Zeros: []complex128{2i}, Poles: []complex128{complex(-1, 1), complex(-1, -1)}, Gain: 1}, filter.ErrStage},
		{"more jω zeros than poles", "zeros", filter.Transfer{Zeros: []complex128{2i, -2i, 3i, -3i}, Poles: []complex128{complex(-1, 1), complex(-1, -1)}, Gain: 1}, filter.ErrStage},
		{"more origin zeros than poles", "zeros", filter.Transfer{Zeros: []complex128{0, 0, 0}, Poles: []complex128{complex(-1, 1), complex(-1, -1)}, Gain: 1}, filter.ErrStage},
	} {
		rows = append(rows, badInput{"Stages: " + c.reason, errs(c.want), c.field, func() error { _, err := c.h.Stages(); return err }})
	}
	rows = append(rows, badInput{"StagesWith unknown GainPlan", errs(filter.ErrStage), "GainPlan",
		func() error { _, err := h.StagesWith(filter.StageOptions{Gain: 9}); return err }})
	// Stage.Validate, one bad field each.
	good := filter.Stage{Kind: filter.NotchStage, Order: 2, F0Hz: 1000, Q: 2, ZeroHz: 1200, Gain: 1}
	with := func(f func(*filter.Stage)) filter.Stage { s := good; f(&s); return s }
	stageRows := []struct {
		reason, field string
		s             filter.Stage
	}{
		{"unknown kind 0", "Kind", with(func(s *filter.Stage) { s.Kind = 0 })},
		{"unknown kind 9", "Kind", with(func(s *filter.Stage) { s.Kind = 9 })},
		{"order 0", "Order", with(func(s *filter.Stage) { s.Order = 0 })},
		{"order 3", "Order", with(func(s *filter.Stage) { s.Order = 3 })},
		{"order -1", "Order", with(func(s *filter.Stage) { s.Order = -1 })},
		{"order 1e9", "Order", with(func(s *filter.Stage) { s.Order = 1e9 })},
		{"first-order notch", "Order", with(func(s *filter.Stage) { s.Order, s.Q = 1, 0 })},
		{"first-order bandpass", "Order", filter.Stage{Kind: filter.BandpassStage, Order: 1, F0Hz: 1, Gain: 1}},
		{"first-order lowpass with a Q", "Q", filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1, Q: 0.7, Gain: 1}},
		{"gain NaN", "Gain", with(func(s *filter.Stage) { s.Gain = nan })},
		{"gain +Inf", "Gain", with(func(s *filter.Stage) { s.Gain = inf })},
		{"gain -Inf", "Gain", with(func(s *filter.Stage) { s.Gain = ninf })},
	}
	for _, x := range badNumbers {
		stageRows = append(stageRows,
			struct {
				reason, field string
				s             filter.Stage
			}{"F0Hz " + x.name, "F0Hz", with(func(s *filter.Stage) { s.F0Hz = x.v })},
			struct {
				reason, field string
				s             filter.Stage
			}{"Q " + x.name, "Q", with(func(s *filter.Stage) { s.Q = x.v })},
			struct {
				reason, field string
				s             filter.Stage
			}{"ZeroHz " + x.name, "ZeroHz", with(func(s *filter.Stage) { s.ZeroHz = x.v })})
	}
	for _, c := range stageRows {
		rows = append(rows, badInput{"Stage.Validate: " + c.reason, errs(filter.ErrStage), c.field, c.s.Validate})
	}
	// JSON: malformed documents for every decoder, and unencodable values.
	type dec struct {
		name string
		into func() json.Unmarshaler
	}
	decoders := []dec{
		{"Spec", func() json.Unmarshaler { return new(filter.Spec) }},
		{"Stage", func() json.Unmarshaler { return new(filter.Stage) }},
		{"Transfer", func() json.Unmarshaler { return new(filter.Transfer) }},
		{"Band", func() json.Unmarshaler { return new(filter.Band) }},
		{"StageKind", func() json.Unmarshaler { return new(filter.StageKind) }},
	}
	junk := []string{``, `{`, `}`, `[`, `"`, `nul`, `{"a":}`, `{,}`, `[1,2`, `{"band":`, `tru`, `1e400`, `{"gain":1}{}`, "\x00", `{"band":"lowpass"`, `0x10`}
	for _, d := range decoders {
		for _, j := range junk {
			rows = append(rows, badInput{fmt.Sprintf("%s.UnmarshalJSON(%q)", d.name, j), errs(filter.ErrFormat), "JSON",
				func() error { return d.into().UnmarshalJSON([]byte(j)) }})
		}
		for _, j := range []string{`3`, `true`, `"x"`, `[]`} {
			// Wrong type for the object decoders; a number, boolean or
			// array for the name decoders ("x" is an unknown name).
			rows = append(rows, badInput{fmt.Sprintf("%s.UnmarshalJSON(%s) wrong type", d.name, j), errs(filter.ErrFormat), "",
				func() error { return d.into().UnmarshalJSON([]byte(j)) }})
		}
	}
	for _, c := range []struct {
		reason, field string
		into          json.Unmarshaler
		data          string
		want          []error
	}{
		{"spec unknown band", "allpass", new(filter.Spec), `{"band":"allpass","pass_hz":[1],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, errs(filter.ErrFormat, filter.ErrSpec)},
		{"spec band number", "band", new(filter.Spec), `{"band":1,"pass_hz":[1],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, errs(filter.ErrFormat)},
		{"spec three edges", "pass_hz", new(filter.Spec), `{"band":"bandpass","pass_hz":[1,2,3],"stop_hz":[1,4],"ripple_db":1,"atten_db":40}`, errs(filter.ErrFormat)},
		{"spec empty edges", "pass_hz", new(filter.Spec), `{"band":"lowpass","pass_hz":[],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, errs(filter.ErrFormat)},
		{"spec missing atten_db", "atten_db", new(filter.Spec), `{"band":"lowpass","pass_hz":[1],"stop_hz":[2],"ripple_db":1}`, errs(filter.ErrFormat)},
		{"spec unknown field", "rippel_db", new(filter.Spec), `{"band":"lowpass","pass_hz":[1],"stop_hz":[2],"rippel_db":1,"atten_db":40}`, errs(filter.ErrFormat)},
		{"spec string ripple", "ripple_db", new(filter.Spec), `{"band":"lowpass","pass_hz":[1],"stop_hz":[2],"ripple_db":"1","atten_db":40}`, errs(filter.ErrFormat)},
		{"spec NaN literal", "JSON", new(filter.Spec), `{"band":"lowpass","pass_hz":[NaN],"stop_hz":[2],"ripple_db":1,"atten_db":40}`, errs(filter.ErrFormat)},
		{"stage unknown kind", "allpass", new(filter.Stage), `{"kind":"allpass","order":2,"f0_hz":1,"q":1,"gain":1}`, errs(filter.ErrFormat, filter.ErrStage)},
		{"stage missing f0_hz", "f0_hz", new(filter.Stage), `{"kind":"lowpass","order":2,"q":1,"gain":1}`, errs(filter.ErrFormat)},
		{"stage fractional order", "order", new(filter.Stage), `{"kind":"lowpass","order":1.5,"f0_hz":1,"gain":1}`, errs(filter.ErrFormat)},
		{"stage huge order", "order", new(filter.Stage), `{"kind":"lowpass","order":1e30,"f0_hz":1,"gain":1}`, errs(filter.ErrFormat)},
		{"transfer pair of three", "poles[0]", new(filter.Transfer), `{"zeros":[],"poles":[[1,2,3]],"gain":1}`, errs(filter.ErrFormat)},
		{"transfer pair of one", "zeros[0]", new(filter.Transfer), `{"zeros":[[1]],"poles":[],"gain":1}`, errs(filter.ErrFormat)},
		{"transfer missing gain", "gain", new(filter.Transfer), `{"zeros":[],"poles":[[-1,0]]}`, errs(filter.ErrFormat)},
		{"transfer pole not an array", "poles", new(filter.Transfer), `{"poles":[-1],"gain":1}`, errs(filter.ErrFormat)},
		{"band unknown name", "lowpas", new(filter.Band), `"lowpas"`, errs(filter.ErrFormat, filter.ErrSpec)},
		{"stage kind unknown name", "Notch", new(filter.StageKind), `"Notch"`, errs(filter.ErrFormat, filter.ErrStage)},
	} {
		rows = append(rows, badInput{"UnmarshalJSON: " + c.reason, c.want, c.field, func() error { return c.into.UnmarshalJSON([]byte(c.data)) }})
	}
	for _, c := range []struct {
		reason, field string
		v             any
		want          error
	}{
		{"band 0", "Band", filter.Band(0), filter.ErrSpec},
		{"stage kind 9", "StageKind", filter.StageKind(9), filter.ErrStage},
		{"stage of kind 9", "StageKind", filter.Stage{Kind: 9, Order: 2, F0Hz: 1, Q: 1, Gain: 1}, filter.ErrStage},
		{"spec NaN PassHz[1]", "PassHz[1]", filter.Spec{Band: filter.Bandpass, PassHz: [2]float64{1, nan}}, filter.ErrSpec},
		{"stage -Inf gain", "Gain", filter.Stage{Kind: filter.LowpassStage, Order: 1, F0Hz: 1, Gain: ninf}, filter.ErrStage},
		{"transfer NaN gain", "Gain", filter.Transfer{Gain: nan}, filter.ErrRange},
		{"transfer infinite pole", "Poles[0]", filter.Transfer{Gain: 1, Poles: []complex128{complex(inf, 0)}}, filter.ErrRange},
		{"spec unknown band", "Band", filter.Spec{Band: 7}, filter.ErrSpec},
		{"spec infinite ripple", "RippleDB", filter.Spec{Band: filter.Lowpass, RippleDB: inf}, filter.ErrSpec},
		{"stage NaN Q", "Q", filter.Stage{Kind: filter.LowpassStage, Order: 2, F0Hz: 1, Q: nan, Gain: 1}, filter.ErrStage},
	} {
		rows = append(rows, badInput{"MarshalJSON: " + c.reason, errs(c.want), c.field,
			func() error { _, err := c.v.(json.Marshaler).MarshalJSON(); return err }})
	}
	return rows
}

func TestBadInputsFilter(t *testing.T) {
	rows := filterBadInputs()
	runBad(t, "filter: ", rows)
	t.Logf("filter: %d bad inputs tried", len(rows))
	// Entry points without an error result: a malformed stage or transfer
	// gives a defined value, never a panic.
	for _, s := range []filter.Stage{{}, {Kind: 9, Order: 2, F0Hz: nan, Q: -1, Gain: inf}, {Kind: filter.NotchStage, Order: 2, F0Hz: 1, Q: 1}} {
		noPanic(t, fmt.Sprintf("Stage%+v.Transfer", s), func() {
			if h := s.Transfer(); h.Gain != 0 || len(h.Poles) != 0 {
				t.Errorf("Stage%+v.Transfer() = %+v, want the zero Transfer", s, h)
			}
		})
	}
	for _, h := range []filter.Transfer{{}, {Poles: []complex128{complex(nan, 0)}, Gain: 1}, {Zeros: []complex128{0, 0, 0}, Gain: inf}} {
		noPanic(t, fmt.Sprintf("Transfer%+v.AtHz", h), func() { _ = h.AtHz(1e3); _ = h.At(complex(nan, nan)) })
	}
}

// outsideFamily is a Family defined outside package filter that returns
// the same prototype (or error) for every order.
type outsideFamily struct {
	h   filter.Transfer
	err error
}

func (o outsideFamily) Prototype(int) (filter.Transfer, error) { return o.h, o.err }
func (outsideFamily) String() string                           { return "Outside" }
