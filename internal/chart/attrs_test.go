package chart

import (
	"bytes"
	"regexp"
	"testing"
	"time"

	"larder/internal/mass"
)

// Pages refuse inline styles (Content-Security-Policy style-src 'self'), so
// a chart carries its colours and fonts as presentation attributes.
func TestChartsHaveNoInlineStyle(t *testing.T) {
	b, err := BodyMassTrend(massSeries(10, time.UTC), mass.KG)
	if err != nil {
		t.Fatal(err)
	}
	parseSVG(t, b)
	if regexp.MustCompile(`\sstyle=`).Match(b) {
		t.Fatalf("chart has inline style attributes:\n%.600s", b)
	}
	for _, want := range []string{`stroke="#1F5F8B"`, `font-family="Liberation Serif"`, `font-style="normal"`, `stroke-width="1.5"`} {
		if !bytes.Contains(b, []byte(want)) {
			t.Errorf("chart lacks %s", want)
		}
	}
}

func TestPresentationAttrs(t *testing.T) {
	in := `<path d="M0 0" style="fill:none;stroke:#000000;stroke-width:0.5;cursor:pointer"/><text font-style="italic" style="font-family:A &amp; B">x</text>`
	want := `<path d="M0 0" fill="none" stroke="#000000" stroke-width="0.5"/><text font-style="italic" font-family="A &amp; B">x</text>`
	if got := string(presentationAttrs([]byte(in))); got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
}
