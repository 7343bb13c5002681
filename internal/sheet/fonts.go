package sheet

import (
	"strings"
	"sync"
	"unicode"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"github.com/go-pdf/fpdf"
	"golang.org/x/image/font/sfnt"
	"golang.org/x/text/unicode/norm"
)

// The sheet prints in Liberation Sans (SIL Open Font License), embedded as
// a Unicode TrueType font and subset to the letters used. The PDF core
// fonts carry only Windows-1252, so a client named "Łukasz Żółć-Nguyễn"
// printed as dots; Liberation Sans covers Latin (with Vietnamese), Greek
// and Cyrillic, and has Helvetica's widths, so the sheet's layout and page
// count are as they were with the core font.

// fontFamily is the name the sheet's fonts are registered under.
const fontFamily = "LiberationSans"

// addFonts registers the regular and bold faces with f. Each embedded face
// costs its parse and subset on every sheet (a few milliseconds and a few
// MB), so the sheet uses two: no italic.
func addFonts(f *fpdf.Fpdf) {
	f.AddUTF8FontFromBytes(fontFamily, "", liberationsansregular.TTF)
	f.AddUTF8FontFromBytes(fontFamily, "B", liberationsansbold.TTF)
}

// coverage answers whether every face has a glyph for a rune; the faces
// share one character set, but a letter printed in bold must exist in bold.
var coverage = sync.OnceValue(func() []*sfnt.Font {
	var out []*sfnt.Font
	for _, ttf := range [][]byte{liberationsansregular.TTF, liberationsansbold.TTF} {
		fnt, err := sfnt.Parse(ttf)
		if err != nil {
			panic("sheet: embedded font: " + err.Error()) // the bytes are compiled in
		}
		out = append(out, fnt)
	}
	return out
})

// covered caches coverage answers: a sheet asks about the same few dozen
// letters thousands of times.
var covered sync.Map // rune → bool

func hasGlyph(r rune) bool {
	if v, ok := covered.Load(r); ok {
		return v.(bool)
	}
	ok := true
	for _, fnt := range coverage() {
		if i, err := fnt.GlyphIndex(nil, r); err != nil || i == 0 {
			ok = false
			break
		}
	}
	covered.Store(r, ok)
	return ok
}

// symbols the font lacks, as the plain equivalents the sheet prints.
var symbols = strings.NewReplacer(
	"‑", "-", "✓", "", "◆", "", "✖", "", "✎", "", "⚠", "", "\u00a0", " ", "\u202f", " ",
)

// printable makes typed text safe to print: valid UTF-8 in composed form
// (a letter typed as base and combining accent becomes the one composed
// letter the font draws), no control characters but line breaks, and every
// letter that neither the font nor a fallback face (fallback.go: Chinese,
// Japanese, Korean) has a glyph for, such as an emoji, as "?", so that
// nothing is dropped silently or drawn as an empty box.
func printable(x string) string {
	x = norm.NFC.String(symbols.Replace(clean(x)))
	return strings.Map(func(r rune) rune {
		if r == '\n' || r == ' ' || faceFor(r) >= 0 {
			return r
		}
		if unicode.Is(unicode.Mn, r) { // a stray combining mark: drop it
			return -1
		}
		return '?'
	}, x)
}
