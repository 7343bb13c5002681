package sheet

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/sheet/sheettest"
)

// example computes one of the example requests of testdata/fuel.
func example(t testing.TB, name string) (fuel.Request, fuel.Plan) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "fuel", name))
	if err != nil {
		t.Fatal(err)
	}
	var req fuel.Request
	if err := json.Unmarshal(b, &req); err != nil {
		t.Fatal(err)
	}
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return req, plan
}

func sheetFor(req fuel.Request, plan fuel.Plan, status string) Sheet {
	published := time.Date(2027, 4, 1, 9, 30, 0, 0, time.UTC)
	measured := time.Date(2027, 3, 29, 0, 0, 0, 0, time.UTC)
	s := Sheet{
		PracticeName: "Fjordside Sports Nutrition", ClientName: "Tomás Arriaga",
		ClientCautions: []string{"Coeliac disease – gluten-free foods only", "History of gut upset on gels"},
		Title:          "Plan for the Harbour Loop – test", KindLabel: "Carbohydrate loading", Protocol: req.Protocol,
		Version: 2, Status: status, BodyMassKg: req.Athlete.BodyMassKg, BodyMassOn: &measured,
		Plan: plan, Printed: published, Training: map[string]string{}, Suggestions: map[string]string{},
	}
	if status != StatusDraft {
		s.PublishedAt = &published
	}
	if req.Event != nil {
		s.EventName = "Harbour Loop Marathon"
		start := req.Event.StartsAt
		s.EventStart = &start
		s.EventZone = "Europe/Oslo"
	}
	for _, ts := range req.Training {
		s.Training[ts.Date] = ts.Start + " run " + strconv.FormatFloat(ts.DurationMin, 'f', 0, 64) + " min (" + ts.Intensity + ")"
	}
	for _, d := range plan.Days {
		for i := range d.Feeds {
			s.Suggestions[menu.FeedKey("day", d.Date, i)] = "2 slices white bread with honey, 1 banana"
		}
	}
	return s
}

func TestParsePaper(t *testing.T) {
	for in, want := range map[string]Paper{"": A4, "a4": A4, "A4": A4, "letter": Letter, " Letter ": Letter} {
		if got, ok := ParsePaper(in); !ok || got != want {
			t.Errorf("ParsePaper(%q) = %q, %v; want %q", in, got, ok, want)
		}
	}
	for _, in := range []string{"a5", "legal", "letterx"} {
		if _, ok := ParsePaper(in); ok {
			t.Errorf("ParsePaper(%q) accepted", in)
		}
	}
}

// A4 is 210 × 297 mm and US Letter 8.5 × 11 in (ISO 216; ANSI/ASME Y14.1):
// 595.28 × 841.89 and 612 × 792 PostScript points (common practice).
func TestPaperSizes(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	for paper, box := range map[Paper]string{A4: "/MediaBox [0 0 595.28 841.89]", Letter: "/MediaBox [0 0 612.00 792.00]"} {
		pdf, err := Render(sheetFor(req, plan, StatusPublished), paper)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Contains(pdf, []byte(box)) {
			t.Errorf("%s sheet lacks %s", paper, box)
		}
	}
}

func TestSheetOfEachExample(t *testing.T) {
	for _, name := range []string{"marathon-loading.json", "cyclist-5h-race.json", "rower-two-sessions.json", "runner-10k-race.json", "training-week.json",
		"ironman-race.json", "stage-race-4-day.json", "ultra-48h-race.json", "ultra-48h-loading.json", "hundred-mile-race.json"} {
		t.Run(name, func(t *testing.T) {
			req, plan := example(t, name)
			for _, paper := range []Paper{A4, Letter} {
				pdf, err := Render(sheetFor(req, plan, StatusPublished), paper)
				if err != nil {
					t.Fatal(err)
				}
				if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" { // to look at them
					_ = os.WriteFile(filepath.Join(dir, strings.TrimSuffix(name, ".json")+"-"+string(paper)+".pdf"), pdf, 0o644)
				}
				if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
					t.Fatalf("not a PDF: %q", pdf[:min(20, len(pdf))])
				}
				// DESIGN.md: one to three pages a clinician can hand over.
				if n := sheettest.Pages(pdf); n < 1 || n > 3 {
					t.Errorf("%s on %s: %d pages, want 1–3", name, paper, n)
				}
				text, ok := sheettest.Text(t, pdf)
				if !ok {
					continue
				}
				want := []string{"Tomás Arriaga", "Fjordside Sports Nutrition", "Coeliac disease – gluten-free foods only",
					"History of gut upset on gels", "Findings", "checks within guideline",
					"page 1 of " + strconv.Itoa(sheettest.Pages(pdf))}
				for _, d := range plan.Days {
					want = append(want, strconv.FormatFloat(d.ChoGPerKg, 'f', 1, 64))
				}
				for _, w := range want {
					if !strings.Contains(text, w) {
						t.Errorf("%s on %s: text lacks %q\n%s", name, paper, w, text)
					}
				}
				if n := strings.Count(text, "not medical advice"); n != sheettest.Pages(pdf) {
					t.Errorf("%s: caution printed %d times on %d pages", name, n, sheettest.Pages(pdf))
				}
				if strings.Contains(text, "DRAFT") {
					t.Errorf("%s: a published sheet is marked as a draft", name)
				}
				for _, f := range plan.Findings {
					if f.Level != fuel.LevelOK && !strings.Contains(text, levelWord(f.Level)) {
						t.Errorf("%s: finding %s (%s) not printed", name, f.Code, f.Level)
					}
				}
			}
		})
	}
}

func TestCautionTextWhole(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	pdf, err := Render(sheetFor(req, plan, StatusPublished), A4)
	if err != nil {
		t.Fatal(err)
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	// DESIGN.md, Safety: the caution, whole, on the sheet.
	if !strings.Contains(text, strings.Join(strings.Fields(fuel.Caution), " ")) {
		t.Errorf("caution not printed whole\n%s", text)
	}
}

func TestDraftWatermark(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	for status, mark := range map[string]string{StatusDraft: DraftMark, StatusSuperseded: SupersededMark} {
		pdf, err := Render(sheetFor(req, plan, status), A4)
		if err != nil {
			t.Fatal(err)
		}
		text, ok := sheettest.Text(t, pdf)
		if !ok {
			t.Skip("pdftotext not installed")
		}
		// Once across the page (pdftotext gives diagonal text letter by
		// letter, hence the spaces dropped) and once in the banner, on
		// every page.
		compact := strings.ReplaceAll(text, " ", "")
		if n, pages := strings.Count(compact, strings.ReplaceAll(mark, " ", "")), sheettest.Pages(pdf); n != 2*pages {
			t.Errorf("%s: mark %q printed %d times on %d pages", status, mark, n, pages)
		}
	}
}

func TestNoCautionsNoBox(t *testing.T) {
	req, plan := example(t, "runner-10k-race.json")
	s := sheetFor(req, plan, StatusPublished)
	s.ClientCautions = nil
	pdf, err := Render(s, A4)
	if err != nil {
		t.Fatal(err)
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	if strings.Contains(text, "Recorded caution") {
		t.Error("a client without recorded cautions got a caution box")
	}
}

func TestPlanZone(t *testing.T) {
	cases := []struct {
		plan, event, want string
		offset            int
	}{
		{"Europe/Oslo", "", "Europe/Oslo", 3600},
		{"+02:00", "", "UTC+02:00", 7200},
		{"", "America/Chicago", "America/Chicago", -6 * 3600},
		{"Nowhere/City", "", "UTC", 0},
	}
	jan := time.Date(2027, 1, 15, 12, 0, 0, 0, time.UTC)
	for _, c := range cases {
		loc, name := planZone(Sheet{Plan: fuel.Plan{TimeZone: c.plan}, EventZone: c.event})
		if _, off := jan.In(loc).Zone(); name != c.want || off != c.offset {
			t.Errorf("planZone(%q, %q) = %s offset %d; want %s offset %d", c.plan, c.event, name, off, c.want, c.offset)
		}
	}
}

func TestTextOutsideTheFont(t *testing.T) {
	cases := map[string]string{
		// Letters the font has print as typed, a base letter and its
		// combining accent as the one composed letter.
		"≈ 35 % – café":       "≈ 35 % – café",
		"Nguye\u0302\u0303n":  "Nguyễn",
		"Łukasz Żółć-Nguyễn":  "Łukasz Żółć-Nguyễn",
		"Ψ Дарья":             "Ψ Дарья",
		"non\u2011breaking ✓": "non-breaking ",
		// Chinese, Japanese and Korean print in a fallback face; a letter
		// no face has is marked, not dropped or drawn as an empty box.
		"李 さくら 김 🙂": "李 さくら 김 ?",
		"a\tb\x00c": "a bc",
	}
	for in, want := range cases {
		if got := printable(in); got != want {
			t.Errorf("printable(%q) = %q, want %q", in, got, want)
		}
	}
}

// A name in letters outside Western Europe prints as typed: the text a
// PDF reader extracts from the sheet is the name itself.
func TestUnicodeNames(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	s := sheetFor(req, plan, StatusPublished)
	s.ClientName = "Łukasz Żółć-Nguyễn"
	s.ClientCautions = []string{"Ăn chay – không sữa (no dairy)", "Аллергия на орехи"}
	s.Title = "Plan für den Ölberg-Lauf"
	s.PracticeName = "Ősz Sports Nutrition"
	pdf, err := Render(s, A4)
	if err != nil {
		t.Fatal(err)
	}
	if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" { // to look at it
		_ = os.WriteFile(filepath.Join(dir, "unicode-names-a4.pdf"), pdf, 0o644)
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	for _, w := range []string{"Łukasz Żółć-Nguyễn", "Ăn chay – không sữa (no dairy)", "Аллергия на орехи", "Plan für den Ölberg-Lauf", "Ősz Sports Nutrition"} {
		if !strings.Contains(text, w) {
			t.Errorf("text lacks %q\n%s", w, text)
		}
	}
	if strings.Contains(text, "?") {
		t.Errorf("a letter printed as \"?\":\n%s", text)
	}
}

// A name in Chinese, Japanese or Korean letters prints as typed, in the
// fallback faces, beside the sheet's own font in the same line; a long
// caution in Chinese wraps between its letters.
func TestCJKNames(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	s := sheetFor(req, plan, StatusPublished)
	s.ClientName = "王芳 (Wang Fang)"
	s.ClientCautions = []string{"乳糖不耐受：不喝牛奶，不吃乳制品。比赛前一天选择低纤维食物，比赛当天早餐清淡，赛中只用训练中试过的能量胶和运动饮料。", "さくら 김민준"}
	s.Title = "马拉松碳水化合物负荷计划"
	for _, form := range []Form{FormStaff, FormAthlete} {
		s.Form = form
		pdf, err := Render(s, A4)
		if err != nil {
			t.Fatal(err)
		}
		if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" { // to look at it
			_ = os.WriteFile(filepath.Join(dir, "cjk-names-"+string(form)+".pdf"), pdf, 0o644)
		}
		text, ok := sheettest.Text(t, pdf)
		if !ok {
			t.Skip("pdftotext not installed")
		}
		flat := strings.Join(strings.Fields(text), "")
		for _, w := range []string{"王芳 (Wang Fang)", "马拉松碳水化合物负荷计划", "さくら 김민준"} {
			if form == FormAthlete && w == "さくら 김민준" {
				continue // recorded cautions never reach the athlete's form
			}
			if !strings.Contains(text, w) {
				t.Errorf("%s form: text lacks %q\n%s", form, w, text)
			}
		}
		if form == FormStaff && !strings.Contains(flat, strings.Join(strings.Fields(s.ClientCautions[0]), "")) {
			t.Errorf("the Chinese caution is not printed whole:\n%s", text)
		}
		if strings.Contains(text, "?") {
			t.Errorf("%s form: a letter printed as \"?\":\n%s", form, text)
		}
	}
}

func BenchmarkLoadingSheet(b *testing.B) {
	b.ReportAllocs()
	raw, err := os.ReadFile(filepath.Join("..", "..", "testdata", "fuel", "marathon-loading.json"))
	if err != nil {
		b.Fatal(err)
	}
	var req fuel.Request
	if err := json.Unmarshal(raw, &req); err != nil {
		b.Fatal(err)
	}
	plan, err := fuel.Compute(req)
	if err != nil {
		b.Fatal(err)
	}
	s := sheetFor(req, plan, StatusPublished)
	for b.Loop() {
		if _, err := Render(s, A4); err != nil {
			b.Fatal(err)
		}
	}
}

// FuzzParsePaper: any ?paper= value is either refused or one of the two sizes.
func FuzzParsePaper(f *testing.F) {
	for _, s := range []string{"", "a4", "letter", "LETTER", "a5", "\x00", "letter\n"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, ok := ParsePaper(s)
		if ok != (p == A4 || p == Letter) {
			t.Fatalf("ParsePaper(%q) = %q, %v", s, p, ok)
		}
	})
}

// FuzzSheetText: whatever staff type into a client's name, cautions or a
// plan title (any UTF-8, long lines, control characters), the sheet renders
// as a PDF of one to three pages for a short plan.
func FuzzSheetText(f *testing.F) {
	f.Add("Tomás Arriaga", "Coeliac disease – gluten-free foods only", "Race ≈ 3 h → finish")
	f.Add("", "", "")
	f.Add("\x00\xff\ufeff", "line one\nline two\r\n\ttab", strings.Repeat("W", 400))
	f.Add("李小龍", "🙂 emoji", "日本語のタイトル")
	req, plan := example(f, "runner-10k-race.json")
	f.Fuzz(func(t *testing.T, name, caution, title string) {
		s := sheetFor(req, plan, StatusPublished)
		s.ClientName, s.ClientCautions, s.Title = name, []string{caution}, title
		pdf, err := Render(s, A4)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
			t.Fatal("not a PDF")
		}
		if n := sheettest.Pages(pdf); n < 1 || n > 3 {
			t.Fatalf("%d pages", n)
		}
	})
}

// BenchmarkCJKSheet is the cost of a sheet that needs the fallback faces
// (a client's name in Chinese): the faces' parse and subset.
func BenchmarkCJKSheet(b *testing.B) {
	req, plan := example(b, "marathon-loading.json")
	s := sheetFor(req, plan, StatusPublished)
	s.ClientName = "王芳"
	for b.Loop() {
		if _, err := Render(s, A4); err != nil {
			b.Fatal(err)
		}
	}
}
