package sheet

import (
	_ "embed"
	"strings"
	"sync"
	"unicode"

	"golang.org/x/image/font/sfnt"
)

// Liberation Sans has no Chinese, Japanese or Korean letters, so a client
// named "王芳" printed as "??". Two openly licensed TrueType (glyf) fonts
// draw what it lacks: Droid Sans Fallback (Apache License 2.0: Chinese
// characters, kana) and NanumSquare Regular (SIL Open Font License 1.1:
// Hangul), both as Debian packages them (fonts-droid-fallback,
// fonts-nanum); their licences are beside them in fonts/. A face is
// registered with a sheet only when a text on it needs it, so an ordinary
// sheet costs what it did: the parse of a fallback face (about 50 ms for
// the 4 MB Chinese face) is paid only by a sheet that prints its letters.

//go:embed fonts/DroidSansFallbackFull.ttf
var droidSansFallback []byte

//go:embed fonts/NanumSquareR.ttf
var nanumSquareRegular []byte

// fallbacks are the faces tried, in order, for a letter the sheet's own
// font lacks. They have one weight: a letter of theirs in a bold line
// prints regular.
var fallbacks = []struct {
	family string
	ttf    []byte
}{
	{"FallbackHan", droidSansFallback},
	{"FallbackHangul", nanumSquareRegular},
}

var fallbackFonts = sync.OnceValue(func() []*sfnt.Font {
	out := make([]*sfnt.Font, len(fallbacks))
	for i, fb := range fallbacks {
		fnt, err := sfnt.Parse(fb.ttf)
		if err != nil {
			panic("sheet: embedded fallback font: " + err.Error()) // the bytes are compiled in
		}
		out[i] = fnt
	}
	return out
})

// faceOf caches faceFor: a sheet asks about the same letters many times.
var faceOf sync.Map // rune → int

// faceFor is the face that draws r: 0 the sheet's own font, i+1 fallback
// i, -1 none.
func faceFor(r rune) int {
	if r < 0x80 {
		return 0
	}
	if v, ok := faceOf.Load(r); ok {
		return v.(int)
	}
	f := -1
	if hasGlyph(r) {
		f = 0
	} else {
		for i, fnt := range fallbackFonts() {
			if g, err := fnt.GlyphIndex(nil, r); err == nil && g != 0 {
				f = i + 1
				break
			}
		}
	}
	faceOf.Store(r, f)
	return f
}

// plain reports whether the sheet's own font draws all of s (printable
// text, so every letter has a face).
func plain(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] >= 0x80 {
			for _, r := range s[i:] {
				if faceFor(r) > 0 {
					return false
				}
			}
			return true
		}
	}
	return true
}

// run is a stretch of text drawn in one face.
type run struct {
	face int
	text string
}

// runsOf splits printable text into runs of one face; spaces and line
// breaks go with the run they are in.
func runsOf(s string) []run {
	var out []run
	start, cur := 0, -2
	for i, r := range s {
		f := faceFor(r)
		if r == ' ' || f < 0 {
			f = max(cur, 0)
		}
		if f != cur && i > start {
			out = append(out, run{cur, s[start:i]})
			start = i
		}
		cur = f
	}
	if start < len(s) {
		out = append(out, run{max(cur, 0), s[start:]})
	}
	return out
}

// useFace sets the current style and size in face f (0 the sheet's own),
// registering a fallback face with this sheet the first time it is used.
func (d *doc) useFace(f int) {
	if f <= 0 {
		d.f.SetFont(fontFamily, d.style, d.size)
		return
	}
	fb := fallbacks[f-1]
	if d.added == nil {
		d.added = map[int]bool{}
	}
	if !d.added[f] {
		d.f.AddUTF8FontFromBytes(fb.family, "", fb.ttf)
		d.added[f] = true
	}
	d.f.SetFont(fb.family, "", d.size)
}

// width is the printed width of printable text s in the current font.
func (d *doc) width(s string) float64 {
	if plain(s) {
		return d.f.GetStringWidth(s)
	}
	var w float64
	for _, r := range runsOf(s) {
		d.useFace(r.face)
		w += d.f.GetStringWidth(r.text)
	}
	d.useFace(0)
	return w
}

// cell is fpdf's CellFormat for printable text, drawing each run of
// letters the sheet's font lacks in the fallback face that has them.
func (d *doc) cell(w, h float64, text, border string, ln int, align string, fill bool) {
	if plain(text) {
		d.f.CellFormat(w, h, text, border, ln, align, fill, 0, "")
		return
	}
	// The box (border and fill) first; a page break it causes moves y.
	d.f.CellFormat(w, h, "", border, 0, align, fill, 0, "")
	x, y := d.f.GetX()-w, d.f.GetY()
	m := d.f.GetCellMargin()
	tw := d.width(text)
	start := x + m
	switch {
	case strings.Contains(align, "R"):
		start = x + w - m - tw
	case strings.Contains(align, "C"):
		start = x + (w-tw)/2
	}
	d.f.SetCellMargin(0)
	d.f.SetXY(start, y)
	for _, r := range runsOf(text) {
		d.useFace(r.face)
		d.f.CellFormat(d.f.GetStringWidth(r.text), h, r.text, "", 0, "L", false, 0, "")
	}
	d.f.SetCellMargin(m)
	d.useFace(0)
	switch ln {
	case 0:
		d.f.SetXY(x+w, y)
	case 1:
		left, _, _, _ := d.f.GetMargins()
		d.f.SetXY(left, y+h)
	default:
		d.f.SetXY(x, y+h)
	}
}

// multi is fpdf's MultiCell (no border, no fill) for typed text.
func (d *doc) multi(w, h float64, text, align string) {
	t := d.tr(text)
	if plain(t) {
		d.f.MultiCell(w, h, t, "", align, false)
		return
	}
	for _, l := range d.lines(text, w) {
		d.cell(w, h, l, "", 2, align, false)
	}
	left, _, _, _ := d.f.GetMargins()
	d.f.SetX(left)
}

// wrap splits printable text that needs a fallback face into lines of at
// most width w: at spaces, and between any two Chinese, Japanese or Korean
// letters, which are written without spaces.
func (d *doc) wrap(text string, w float64) []string {
	var out []string
	for _, para := range strings.Split(text, "\n") {
		var line strings.Builder
		for _, tok := range tokens(para) {
			cand := line.String() + tok
			if line.Len() > 0 && d.width(strings.TrimRight(cand, " ")) > w {
				out = append(out, strings.TrimRight(line.String(), " "))
				line.Reset()
				tok = strings.TrimLeft(tok, " ")
			}
			line.WriteString(tok)
		}
		out = append(out, strings.TrimRight(line.String(), " "))
	}
	return out
}

// tokens cuts s into the pieces a line may break between: words with the
// spaces after them, and single letters of the scripts written without
// spaces.
func tokens(s string) []string {
	var out []string
	start := 0
	for i, r := range s {
		switch {
		case unicode.In(r, unicode.Han, unicode.Hiragana, unicode.Katakana, unicode.Hangul):
			if i > start {
				out = append(out, s[start:i])
			}
			out = append(out, string(r))
			start = i + len(string(r))
		case r == ' ' && i+1 < len(s) && s[i+1] != ' ':
			out = append(out, s[start:i+1])
			start = i + 1
		}
	}
	if start < len(s) {
		out = append(out, s[start:])
	}
	return out
}
