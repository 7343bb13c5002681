package server

import (
	"net/url"
	"strings"
	"testing"
	"unicode/utf8"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/store"
)

// FuzzDecodeNotes: whatever is typed into a note box is either refused
// with a message beside that box, or kept trimmed, as valid text within
// the length the phone page allows, on a day of the plan.
func FuzzDecodeNotes(f *testing.F) {
	f.Add("Eat breakfast.", "Long run: a gel every 45 min.")
	f.Add("", "")
	f.Add("\x00", "\xff\xfe")
	f.Add(strings.Repeat("é", store.PlanNoteMax+1), strings.Repeat("x", store.DayNoteMax))
	f.Add("  line one\r\nline two  ", "\t")
	plan := fuel.Plan{Days: []fuel.Day{{Date: "2027-03-01"}, {Date: "2027-03-02"}}}
	if decodeNotes(url.Values{"gkg_2027-03-01": {"10"}}, plan, &forms.Form{Errors: forms.Errors{}}) != nil {
		f.Error("a form without note boxes changed the notes")
	}
	f.Fuzz(func(t *testing.T, planNote, dayNote string) {
		values := url.Values{planNoteName: {planNote}, dayNoteName("2027-03-02"): {dayNote}, dayNoteName("2031-01-01"): {"not a plan day"}}
		form := forms.FromValues(values)
		n := decodeNotes(values, plan, &form)
		if n == nil {
			t.Fatal("notes sent but none decoded")
		}
		for name, text := range map[string]string{planNoteName: n.Plan, dayNoteName("2027-03-02"): n.Day("2027-03-02")} {
			if form.Err(name) != "" {
				if text != "" {
					t.Fatalf("%s refused (%s) yet kept as %q", name, form.Err(name), text)
				}
				continue
			}
			if !utf8.ValidString(text) || strings.ContainsRune(text, 0) || text != strings.TrimSpace(text) || strings.Contains(text, "\r\n") {
				t.Fatalf("%s kept as %q", name, text)
			}
		}
		if utf8.RuneCountInString(n.Plan) > store.PlanNoteMax || utf8.RuneCountInString(n.Day("2027-03-02")) > store.DayNoteMax {
			t.Fatalf("a note over its length was kept: %d, %d", utf8.RuneCountInString(n.Plan), utf8.RuneCountInString(n.Day("2027-03-02")))
		}
		if n.Day("2031-01-01") != "" {
			t.Fatal("a note on a date outside the plan was kept")
		}
	})
}
