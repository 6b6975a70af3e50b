package textable

import (
	"io"
	"strings"
	"unicode/utf8"
)

// Table is a table under construction. Right[i] aligns column i to the
// right (numbers); other columns align left.
type Table struct {
	Indent string
	Right  []bool
	rows   [][]string
}

// Row appends a row of cells.
func (t *Table) Row(cells ...string) { t.rows = append(t.rows, cells) }

// WriteTo writes the table to w, one line per row, without trailing
// spaces.
func (t *Table) WriteTo(w io.Writer) (int64, error) {
	var width []int
	for _, r := range t.rows {
		for i, c := range r {
			if i >= len(width) {
				width = append(width, 0)
			}
			width[i] = max(width[i], utf8.RuneCountInString(c))
		}
	}
	var b strings.Builder
	for _, r := range t.rows {
		line := t.Indent
		for i, c := range r {
			pad := strings.Repeat(" ", width[i]-utf8.RuneCountInString(c))
			if i > 0 {
				line += "  "
			}
			if i < len(t.Right) && t.Right[i] {
				line += pad + c
			} else {
				line += c + pad
			}
		}
		b.WriteString(strings.TrimRight(line, " ") + "\n")
	}
	n, err := io.WriteString(w, b.String())
	return int64(n), err
}
