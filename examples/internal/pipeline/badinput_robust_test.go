package pipeline_test

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/rolloff/rolloff/examples/internal/pipeline"
	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
	"github.com/rolloff/rolloff/topology"
)

// TestBadRequestTable extends the package's own TestBadRequests with the
// inputs a configuration file can hold by mistake: every mask field
// spoiled in every band (through the JSON path a tool uses), numbers of
// the wrong type or beyond float64, junk names, malformed and truncated
// JSON. Each must come back as a *FieldError wrapping ErrRequest (and the
// layer's sentinel where one applies) naming the field, before any design
// work starts, never a panic. Each row has a reason.
func TestBadRequestTable(t *testing.T) {
	masks := map[string]string{
		"lowpass":  `{"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}`,
		"highpass": `{"band": "highpass", "pass_hz": [4000], "stop_hz": [1000], "ripple_db": 1, "atten_db": 40}`,
		"bandpass": `{"band": "bandpass", "pass_hz": [900, 1100], "stop_hz": [500, 2000], "ripple_db": 1, "atten_db": 40}`,
		"bandstop": `{"band": "bandstop", "pass_hz": [500, 2000], "stop_hz": [900, 1100], "ripple_db": 1, "atten_db": 40}`,
	}
	type row struct {
		reason, body, field string
		also                error
	}
	var rows []row
	mask := func(b, m string) string { return `{"mask": ` + m + `}` }
	for _, b := range []string{"lowpass", "highpass", "bandpass", "bandstop"} {
		m := masks[b]
		for _, bad := range []struct{ name, v string }{{"zero", "0"}, {"negative", "-1"}, {"tiny negative", "-1e-300"}} {
			for _, f := range []string{"ripple_db", "atten_db"} {
				rows = append(rows, row{fmt.Sprintf("%s %s %s", b, f, bad.name), mask(b, replaceNumber(m, f, bad.v)), "mask", filter.ErrSpec})
			}
			rows = append(rows, row{fmt.Sprintf("%s pass_hz %s", b, bad.name), mask(b, replaceFirstEdge(m, "pass_hz", bad.v)), "mask", filter.ErrSpec})
			rows = append(rows, row{fmt.Sprintf("%s stop_hz %s", b, bad.name), mask(b, replaceFirstEdge(m, "stop_hz", bad.v)), "mask", filter.ErrSpec})
		}
		rows = append(rows,
			row{b + " ripple equal to attenuation", mask(b, replaceNumber(m, "ripple_db", "40")), "mask", filter.ErrSpec},
			row{b + " ripple above attenuation", mask(b, replaceNumber(m, "ripple_db", "60")), "mask", filter.ErrSpec},
			row{b + " edges swapped", mask(b, swapEdges(m)), "mask", filter.ErrSpec},
			row{b + " number beyond float64", mask(b, replaceNumber(m, "atten_db", "1e400")), "mask", nil},
			row{b + " string number", mask(b, replaceNumber(m, "atten_db", `"40"`)), "mask", filter.ErrFormat},
			row{b + " null edges", mask(b, strings.Replace(m, `"stop_hz": [`, `"stop_hz": null, "x": [`, 1)), "mask", filter.ErrFormat},
			row{b + " unknown mask field", mask(b, strings.Replace(m, `"band"`, `"bandd": 1, "band"`, 1)), "mask", filter.ErrFormat},
		)
	}
	const ok = `"mask": {"band": "lowpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}`
	rows = append(rows,
		row{"bandpass with one edge each", mask("", `{"band": "bandpass", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}`), "mask", filter.ErrSpec},
		row{"three edges", mask("", `{"band": "bandpass", "pass_hz": [1, 2, 3], "stop_hz": [0.5, 4], "ripple_db": 1, "atten_db": 40}`), "mask", filter.ErrFormat},
		row{"band as a number", mask("", `{"band": 1, "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}`), "mask", filter.ErrFormat},
		row{"band in capitals", mask("", `{"band": "LOWPASS", "pass_hz": [1000], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}`), "mask", filter.ErrSpec},
		row{"mask a string", `{"mask": "lowpass 1 kHz"}`, "mask", nil},
		row{"mask an array", `{"mask": []}`, "mask", nil},
		row{"mask null", `{"mask": null}`, "mask", nil},
		row{"empty mask", `{"mask": {}}`, "mask", nil},
		row{"family not a list", `{` + ok + `, "families": "butterworth"}`, "families", nil},
		row{"family a number", `{` + ok + `, "families": [1]}`, "families", nil},
		row{"family empty name", `{` + ok + `, "families": [""]}`, "families[0]", nil},
		row{"family junk", `{` + ok + `, "families": ["butterworth", "\u0000"]}`, "families[1]", nil},
		row{"kind a number", `{` + ok + `, "kind": 3}`, "kind", nil},
		row{"kind junk", `{` + ok + `, "kind": "sallen key"}`, "kind", topology.ErrKind},
		row{"kind written as an unknown Kind value", `{` + ok + `, "kind": "Kind(99)"}`, "kind", topology.ErrKind},
		row{"series junk", `{` + ok + `, "resistor_series": "E96 "}`, "resistor_series", series.ErrSeries},
		row{"series lower-case junk", `{` + ok + `, "capacitor_series": "e13"}`, "capacitor_series", series.ErrSeries},
		row{"series a number", `{` + ok + `, "resistor_series": 96}`, "resistor_series", nil},
		row{"tolerance 50 %", `{` + ok + `, "resistor_tol_pct": 50}`, "resistor_tol_pct", nil},
		row{"tolerance a string", `{` + ok + `, "capacitor_tol_pct": "5%"}`, "capacitor_tol_pct", nil},
		row{"distribution junk", `{` + ok + `, "distribution": "gauss"}`, "distribution", nil},
		row{"cap_f beyond float64", `{` + ok + `, "cap_f": 1e999}`, "cap_f", nil},
		row{"trials fractional", `{` + ok + `, "trials": 1.5}`, "trials", nil},
		row{"trials above the limit", `{` + ok + `, "trials": 200001}`, "trials", nil},
		row{"trials absurd", `{` + ok + `, "trials": 1e30}`, "trials", nil},
		row{"seed negative", `{` + ok + `, "seed": -1}`, "seed", nil},
		row{"seed beyond uint64", `{` + ok + `, "seed": 18446744073709551616}`, "seed", nil},
		row{"margin as large as half the ripple", `{` + ok + `, "margin_db": 0.5}`, "margin_db", nil},
		row{"margin a string", `{` + ok + `, "margin_db": "0.1"}`, "margin_db", nil},
		row{"yield negative", `{` + ok + `, "min_yield_pct": -5}`, "min_yield_pct", nil},
		row{"name a number", `{` + ok + `, "name": 5}`, "name", nil},
		row{"duplicate key with a bad value", `{` + ok + `, "trials": 10, "trials": -10}`, "trials", nil},
		row{"misspelled field", `{` + ok + `, "famillies": ["bessel"]}`, "famillies", nil},
		row{"byte-order mark", "\ufeff{" + ok + `}`, "", nil},
		row{"truncated", `{` + ok, "", nil},
		row{"trailing garbage", `{` + ok + `}x`, "", nil},
		row{"two documents", `{` + ok + `}{` + ok + `}`, "", nil},
		row{"a bare number", `42`, "", nil},
		row{"a bare string", `"lowpass"`, "", nil},
		row{"only whitespace", " \n\t ", "", nil},
		row{"deep nesting", strings.Repeat("[", 10000) + strings.Repeat("]", 10000), "", nil},
		row{"invalid UTF-8 in a name", "{" + ok + `, "name": "` + "\xff\xfe" + `", "kind": "x"}`, "kind", topology.ErrKind},
		row{"comment", `{` + ok + `, // a comment
		}`, "", nil},
		row{"single quotes", `{'mask': {}}`, "", nil},
		row{"NaN literal", `{"mask": {"band": "lowpass", "pass_hz": [NaN], "stop_hz": [4000], "ripple_db": 1, "atten_db": 40}}`, "", nil},
	)
	tried := 0
	for _, r := range rows {
		tried++
		var err error
		func() {
			defer func() {
				if p := recover(); p != nil {
					t.Errorf("%s: panic %v", r.reason, p)
				}
			}()
			var req pipeline.Request
			req, err = pipeline.DecodeRequestBytes([]byte(r.body))
			if err == nil {
				_, err = req.Resolve()
			}
		}()
		if testing.Verbose() {
			t.Logf("%s: %v", r.reason, err)
		}
		var fe *pipeline.FieldError
		if !errors.As(err, &fe) || !errors.Is(err, pipeline.ErrRequest) {
			t.Errorf("%s: error %v is not a *FieldError wrapping ErrRequest", r.reason, err)
			continue
		}
		if fe.Field != r.field {
			t.Errorf("%s: field %q, want %q (%v)", r.reason, fe.Field, r.field, err)
		}
		if r.field != "" && !strings.Contains(err.Error(), "field "+r.field) {
			t.Errorf("%s: message %q does not name field %q", r.reason, err, r.field)
		}
		if r.also != nil && !errors.Is(err, r.also) {
			t.Errorf("%s: error %v does not wrap %v", r.reason, err, r.also)
		}
	}
	// Result documents: malformed or of another version.
	for _, d := range []struct{ reason, body string }{
		{"empty", ``}, {"truncated", `{"version": "rolloff.design/v1"`}, {"other version", `{"version": "rolloff.design/v2"}`},
		{"no version", `{}`}, {"unknown field", `{"version": "rolloff.design/v1", "verdict": "ok"}`},
		{"transfer pair of three", `{"version": "rolloff.design/v1", "design": {"zeros": [], "poles": [[1, 2, 3]], "gain": 1}}`},
		{"stage unknown kind", `{"version": "rolloff.design/v1", "stages": [{"target": {"kind": "allpass", "order": 2, "f0_hz": 1, "q": 1, "gain": 1}}]}`},
		{"wrong type", `{"version": "rolloff.design/v1", "order": "four"}`}, {"array", `[]`},
	} {
		tried++
		if _, err := pipeline.UnmarshalDocument([]byte(d.body)); err == nil || !strings.HasPrefix(err.Error(), "pipeline: document") {
			t.Errorf("document %s: error %v, want one starting \"pipeline: document\"", d.reason, err)
		}
	}
	t.Logf("%d bad request and document inputs tried", tried)
}

// replaceNumber replaces the value of the numeric field f in the JSON
// object text m.
func replaceNumber(m, f, v string) string {
	i := strings.Index(m, `"`+f+`": `)
	if i < 0 {
		panic(f)
	}
	j := i + len(f) + 4
	k := j
	for k < len(m) && m[k] != ',' && m[k] != '}' {
		k++
	}
	return m[:j] + v + m[k:]
}

// replaceFirstEdge replaces the first element of the edge array f.
func replaceFirstEdge(m, f, v string) string {
	i := strings.Index(m, `"`+f+`": [`) + len(f) + 5
	k := i
	for m[k] != ',' && m[k] != ']' {
		k++
	}
	return m[:i] + v + m[k:]
}

// swapEdges swaps the pass_hz and stop_hz arrays.
func swapEdges(m string) string {
	m = strings.Replace(m, `"pass_hz"`, `"tmp_hz"`, 1)
	m = strings.Replace(m, `"stop_hz"`, `"pass_hz"`, 1)
	return strings.Replace(m, `"tmp_hz"`, `"stop_hz"`, 1)
}
