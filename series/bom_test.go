package series

import (
	"bytes"
	"encoding/csv"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/rolloff/rolloff/topology"
)

// A two-stage chain written by hand (a sensor front end of our own
// invention): its parts are numbered per stage, as topology numbers them.
var bomChain = topology.Chain{Circuits: []topology.Circuit{
	{Kind: topology.SallenKey, Parts: []topology.Part{
		{Ref: "R1", Value: 10e3}, {Ref: "R2", Value: 10e3}, {Ref: "C1", Value: 10e-9}, {Ref: "C2", Value: 4.7e-9}}},
	{Kind: topology.MultipleFeedback, Parts: []topology.Part{
		{Ref: "R1", Value: 10e3}, {Ref: "R2", Value: 15.8e3}, {Ref: "R3", Value: 1234}, {Ref: "C1", Value: 10e-9}, {Ref: "C2", Value: 1e-9}}},
}}

func TestBOM(t *testing.T) {
	items, err := Items(bomChain, E24, E6, Tolerances{Resistor: 0.01, Part: map[string]float64{"U2.C2": 0.02}})
	if err != nil {
		t.Fatal(err)
	}
	got := BOM(items)
	want := []Line{
		{Resistor, 1234, Series{}, 0.01, 1, []string{"U2.R3"}},
		{Resistor, 10e3, E24, 0.01, 3, []string{"U1.R1", "U1.R2", "U2.R1"}},
		{Resistor, 15.8e3, E96, 0.01, 1, []string{"U2.R2"}},
		{Capacitor, 1e-9, E6, 0.02, 1, []string{"U2.C2"}},
		{Capacitor, 4.7e-9, E6, 0.2, 1, []string{"U1.C2"}},
		{Capacitor, 10e-9, E6, 0.2, 2, []string{"U1.C1", "U2.C1"}},
	}
	if diff := cmp.Diff(want, got, cmp.AllowUnexported(Series{})); diff != "" {
		t.Fatalf("BOM (-want +got):\n%s", diff)
	}
	var buf bytes.Buffer
	if err := WriteCSV(&buf, got); err != nil {
		t.Fatal(err)
	}
	wantCSV := `kind,value,display,code,series,tolerance,count,refs
resistor,1234,1.234 kΩ,1K234,,1,1,U2.R3
resistor,10000,10 kΩ,10K,E24,1,3,"U1.R1, U1.R2, U2.R1"
resistor,15800,15.8 kΩ,15K8,E96,1,1,U2.R2
capacitor,1e-09,1 nF,1n0,E6,2,1,U2.C2
capacitor,4.7e-09,4.7 nF,4n7,E6,20,1,U1.C2
capacitor,1e-08,10 nF,10n,E6,20,2,"U1.C1, U2.C1"
`
	if diff := cmp.Diff(wantCSV, buf.String()); diff != "" {
		t.Errorf("CSV (-want +got):\n%s", diff)
	}
	// The CSV reads back with encoding/csv, every row as wide as the header.
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil || len(recs) != len(want)+1 {
		t.Fatalf("read back: %d records, %v", len(recs), err)
	}
	// Deterministic: the same items in any order give the same lines.
	rev := append([]Item(nil), items...)
	for i, j := 0, len(rev)-1; i < j; i, j = i+1, j-1 {
		rev[i], rev[j] = rev[j], rev[i]
	}
	for _, l := range BOM(rev) {
		for i := 1; i < len(l.Refs); i++ {
			// refs are in the order given, here reversed
			if l.Refs[i-1] < l.Refs[i] {
				t.Errorf("refs %v not in the order given", l.Refs)
			}
		}
	}
	if diff := cmp.Diff(len(want), len(BOM(rev))); diff != "" {
		t.Error(diff)
	}
}

func TestItemsErrors(t *testing.T) {
	bad := topology.Chain{Circuits: []topology.Circuit{{Parts: []topology.Part{{Ref: "L1", Value: 1e-3}}}}}
	if _, err := Items(bad, E24, E6, Tolerances{}); !errors.Is(err, ErrChain) {
		t.Errorf("L1: %v, want ErrChain", err)
	}
	bad = topology.Chain{Circuits: []topology.Circuit{{Parts: []topology.Part{{Ref: "R1", Value: -1}}}}}
	if _, err := Items(bad, E24, E6, Tolerances{}); !errors.Is(err, ErrChain) {
		t.Errorf("negative R: %v, want ErrChain", err)
	}
	if _, err := Items(bomChain, E24, E6, Tolerances{Capacitor: 1.5}); !errors.Is(err, ErrPolicy) {
		t.Errorf("tolerance 150 %%: %v, want ErrPolicy", err)
	}
}
