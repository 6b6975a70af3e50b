package pipeline

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
)

// MarshalDocument returns d as indented JSON with a final newline: the
// form every example writes. The output depends only on d (fixed field
// order, no maps), so the same document gives the same bytes.
func MarshalDocument(d Document) ([]byte, error) {
	b, err := json.MarshalIndent(d, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("pipeline: document JSON: %w", err)
	}
	return append(b, '\n'), nil
}

// UnmarshalDocument reads a document written by MarshalDocument, strictly
// (unknown fields are errors), and checks its Version and that its request
// resolves (a mask, known families and series). Errors wrap ErrDocument (and,
// for the request, the *FieldError naming the field).
func UnmarshalDocument(b []byte) (Document, error) {
	var d Document
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&d); err != nil {
		return Document{}, fmt.Errorf("pipeline: document JSON: %w: %w", err, ErrDocument)
	}
	if d.Version != Version {
		return Document{}, fmt.Errorf("pipeline: document version %q (want %q): %w", d.Version, Version, ErrDocument)
	}
	// The request a document carries was resolved before the design ran:
	// it must resolve again unchanged, so a document that could not have
	// been written (no mask, a bad series name) is refused here.
	if _, err := d.Request.Resolve(); err != nil {
		return Document{}, fmt.Errorf("pipeline: document %w: %w", WithPath(err, "request"), ErrDocument)
	}
	return d, nil
}

// WriteBOM writes the result's bill of materials as CSV (series.WriteCSV).
func (r Result) WriteBOM(w io.Writer) error { return series.WriteCSV(w, r.Lines) }

// WriteSPICE writes the snapped chain as a SPICE deck
// (topology.Chain.WriteSPICE).
func (r Result) WriteSPICE(w io.Writer) error { return r.Snapped.WriteSPICE(w) }

// Files names the artifacts WriteFiles writes for a design called base.
type Files struct {
	JSON  string // base + ".json": the Document
	BOM   string // base + "-bom.csv": the bill of materials
	SPICE string // base + ".cir": the SPICE deck of the snapped chain
}

// FilesFor returns the artifact names for base.
func FilesFor(base string) Files {
	return Files{JSON: base + ".json", BOM: base + "-bom.csv", SPICE: base + ".cir"}
}

// WriteFiles writes the document, the bill of materials and the SPICE deck
// of r into dir (which must exist) under the names FilesFor(base), and
// returns those names. Each file's bytes depend only on r.
func WriteFiles(dir, base string, r Result) (Files, error) {
	f := FilesFor(base)
	doc, err := MarshalDocument(r.Doc)
	if err != nil {
		return f, err
	}
	if err := os.WriteFile(filepath.Join(dir, f.JSON), doc, 0o644); err != nil {
		return f, fmt.Errorf("pipeline: %w", err)
	}
	if err := writeFile(filepath.Join(dir, f.BOM), r.WriteBOM); err != nil {
		return f, err
	}
	if err := writeFile(filepath.Join(dir, f.SPICE), r.WriteSPICE); err != nil {
		return f, err
	}
	return f, nil
}

func writeFile(path string, write func(io.Writer) error) error {
	var buf bytes.Buffer
	bw := bufio.NewWriter(&buf)
	if err := write(bw); err != nil {
		return fmt.Errorf("pipeline: %s: %w", filepath.Base(path), err)
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("pipeline: %s: %w", filepath.Base(path), err)
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		return fmt.Errorf("pipeline: %w", err)
	}
	return nil
}

// SnappedTransfer returns the transfer function of the snapped chain from
// its parts (each circuit's nodal analysis, ideal op-amps), with the sign
// of inverting circuits removed, so that it compares with Design in phase
// as well as in gain.
func (r Result) SnappedTransfer() (filter.Transfer, error) {
	h := filter.Transfer{Gain: 1}
	for i, c := range r.Snapped.Circuits {
		t, err := c.Transfer()
		if err != nil {
			return filter.Transfer{}, fmt.Errorf("pipeline: stage %d transfer: %w", i+1, err)
		}
		h.Zeros = append(h.Zeros, t.Zeros...)
		h.Poles = append(h.Poles, t.Poles...)
		h.Gain *= t.Gain
	}
	// Compare the signs where both pass: in the middle of the first
	// passband band (log scale).
	pass, err := series.PassbandOf(r.Doc.Request.Mask)
	if err != nil {
		return filter.Transfer{}, fmt.Errorf("pipeline: %w", err)
	}
	f := math.Sqrt(pass[0].LoHz * pass[0].HiHz)
	if real(h.AtHz(f)*cmplx.Conj(r.Design.AtHz(f))) < 0 {
		h.Gain = -h.Gain
	}
	return h, nil
}
