package textable

import (
	"strings"
	"testing"
)

func TestTableAlignment(t *testing.T) {
	tb := &Table{Indent: "> ", Right: []bool{false, true}}
	tb.Row("name", "value", "note")
	tb.Row("µ-long-name", "1.5", "")
	tb.Row("x", "12345", "ok")
	var b strings.Builder
	if _, err := tb.WriteTo(&b); err != nil {
		t.Fatal(err)
	}
	want := "" +
		"> name         value  note\n" +
		"> µ-long-name    1.5\n" +
		"> x            12345  ok\n"
	if b.String() != want {
		t.Errorf("got\n%s\nwant\n%s", b.String(), want)
	}
}
