package sheet

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"larder/internal/sheet/sheettest"
	"larder/internal/sources"
)

// Words and units that belong to the dietitian's form only: guideline
// checks and their sources, the fat-free mass, the glycogen model's units,
// overrides and the recorded cautions box.
var staffOnly = []string{
	"mmol", "kcal/kg", "FFM", "fat-free", "Fat-free", "Findings", "Checked against", "within guideline", "guideline",
	"from memory", "common practice", "model", "Source", "IOC", "ACSM", "REDs", "Mountjoy", "glycogen", "Glycogen",
	"override", "g/kg", "Recorded caution", "Load band", "range ", "et al",
}

func athleteSheet(t *testing.T, name string, showFigures bool) (Sheet, string, int) {
	t.Helper()
	req, plan := example(t, name)
	s := sheetFor(req, plan, StatusPublished)
	s.Form = FormAthlete
	s.ShowFigures = showFigures
	s.SharedNote = []string{"Keep to gluten-free foods."}
	s.PlanNote = "Eat breakfast within an hour of waking.\nBring your own bottles on race day."
	s.DayNotes = map[string]string{plan.Days[len(plan.Days)-1].Date: "Have a recovery shake after the cool-down."}
	pdf, err := Render(s, A4)
	if err != nil {
		t.Fatal(err)
	}
	if dir := os.Getenv("LARDER_SHEET_OUT"); dir != "" { // to look at them
		fig := "-nofigures"
		if showFigures {
			fig = "-figures"
		}
		_ = os.WriteFile(filepath.Join(dir, "athlete-"+strings.TrimSuffix(name, ".json")+fig+".pdf"), pdf, 0o644)
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	return s, text, sheettest.Pages(pdf)
}

// The athlete's form speaks plainly: none of the dietitian's words or
// units, never a recorded caution, the shared health note and the
// dietitian's notes, every feeding time with its food.
func TestAthleteFormPlainWords(t *testing.T) {
	for _, name := range []string{"marathon-loading.json", "cyclist-5h-race.json", "rower-two-sessions.json", "runner-10k-race.json", "training-week.json"} {
		t.Run(name, func(t *testing.T) {
			s, text, pages := athleteSheet(t, name, false)
			if pages < 1 || pages > 4 {
				t.Errorf("%d pages, want 1–4", pages)
			}
			for _, w := range staffOnly {
				if strings.Contains(text, w) {
					t.Errorf("the athlete's form says %q:\n%s", w, text)
				}
			}
			for _, c := range s.ClientCautions {
				if strings.Contains(text, c) {
					t.Errorf("a recorded caution reached the athlete's form: %q", c)
				}
			}
			// Energy and body-mass figures are off unless the dietitian shows them.
			for _, w := range []string{"kcal", " kg", "per kg", "58 kg"} {
				if strings.Contains(text, w) {
					t.Errorf("figures hidden, yet the form says %q:\n%s", w, text)
				}
			}
			want := []string{"Your fuelling plan", "For Tomás Arriaga", "A note about your health", "Keep to gluten-free foods.",
				"From your dietitian", "Eat breakfast within an hour of waking.", "Bring your own bottles on race day.",
				"Your dietitian: Have a recovery shake after the cool-down.", "not medical advice"}
			for _, d := range s.Plan.Days {
				want = append(want, dayWords(d.Date))
				for _, f := range d.Feeds {
					want = append(want, f.At.In(mustZone(t, s)).Format("15:04")+" "+mealWords(f.Label))
				}
			}
			for _, w := range want {
				if !strings.Contains(text, w) {
					t.Errorf("the athlete's form lacks %q:\n%s", w, text)
				}
			}
		})
	}
}

// With figures shown, the day's energy and carbohydrate per kg appear.
func TestAthleteFormFiguresWhenShown(t *testing.T) {
	s, text, _ := athleteSheet(t, "marathon-loading.json", true)
	d := s.Plan.Days[0]
	for _, w := range []string{"about " + num(d.EnergyKcal, 0) + " kcal", num(d.ChoGPerKg, 1) + " g carbohydrate per kg body weight"} {
		if !strings.Contains(text, w) {
			t.Errorf("figures shown, yet the form lacks %q:\n%s", w, text)
		}
	}
	if s.Plan.ExpectedMassGainKg != nil && !strings.Contains(text, "You may weigh about "+num(*s.Plan.ExpectedMassGainKg, 1)) {
		t.Errorf("the expected body-mass gain is not printed:\n%s", text)
	}
	for _, w := range staffOnly {
		if strings.Contains(text, w) {
			t.Errorf("figures shown, the athlete's form still says %q", w)
		}
	}
}

// The dietitian's form keeps its cautions and figures, and lists the notes
// given to the athlete.
func TestStaffFormListsNotes(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	s := sheetFor(req, plan, StatusPublished)
	s.PlanNote = "Eat breakfast within an hour of waking."
	s.DayNotes = map[string]string{plan.Days[0].Date: "Easy day: keep the snacks small."}
	s.SharedNote = []string{"Keep to gluten-free foods."}
	pdf, err := Render(s, A4)
	if err != nil {
		t.Fatal(err)
	}
	text, ok := sheettest.Text(t, pdf)
	if !ok {
		t.Skip("pdftotext not installed")
	}
	for _, w := range []string{"Plan sheet", "Recorded caution", "Coeliac disease", "Findings", "Notes to the athlete",
		"Whole plan Eat breakfast within an hour of waking.", dayWords(plan.Days[0].Date) + " Easy day: keep the snacks small."} {
		if !strings.Contains(text, w) {
			t.Errorf("the dietitian's form lacks %q:\n%s", w, text)
		}
	}
	if n := sheettest.Pages(pdf); n > 3 {
		t.Errorf("%d pages", n)
	}
}

func TestParseForm(t *testing.T) {
	for in, want := range map[string]Form{"": FormStaff, "staff": FormStaff, "athlete": FormAthlete, " Athlete ": FormAthlete} {
		if got, ok := ParseForm(in); !ok || got != want {
			t.Errorf("ParseForm(%q) = %q, %v", in, got, ok)
		}
	}
	if _, ok := ParseForm("client"); ok {
		t.Error("ParseForm accepted an unknown form")
	}
}

func mustZone(t *testing.T, s Sheet) *time.Location {
	t.Helper()
	loc, _ := planZone(s)
	return loc
}

func BenchmarkAthleteSheet(b *testing.B) {
	req, plan := example(b, "marathon-loading.json")
	s := sheetFor(req, plan, StatusPublished)
	s.Form = FormAthlete
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Render(s, A4); err != nil {
			b.Fatal(err)
		}
	}
}

// The dietitian's form cites each finding's source by its short citation;
// "(from memory)" and the other status words are on the Sources page.
func TestStaffFormShortCitations(t *testing.T) {
	for _, name := range []string{"marathon-loading.json", "cyclist-5h-race.json", "rower-two-sessions.json", "runner-10k-race.json", "training-week.json", "ironman-race.json"} {
		req, plan := example(t, name)
		pdf, err := Render(sheetFor(req, plan, StatusPublished), A4)
		if err != nil {
			t.Fatal(err)
		}
		text, ok := sheettest.Text(t, pdf)
		if !ok {
			t.Skip("pdftotext not installed")
		}
		for _, w := range []string{"from memory", "common practice", "model assumption", "(review)"} {
			if strings.Contains(text, w) {
				t.Errorf("%s: the dietitian's form says %q:\n%s", name, w, text)
			}
		}
		cited := false
		for _, f := range plan.Findings {
			if f.Level != "ok" && f.Source != "" {
				cited = true
				if !strings.Contains(text, "Checked against: "+sources.Short(f.Source)) {
					t.Errorf("%s: finding %s not cited as %q", name, f.Code, sources.Short(f.Source))
				}
			}
		}
		if !cited && name == "marathon-loading.json" {
			t.Errorf("%s: no cited finding to check", name)
		}
	}
}

// Events as they are raced reach the athlete's form too: each leg with its
// carbohydrate (none in the swim, where one cannot eat: common practice),
// each stage with its in-stage grams per hour, and a race over a day by
// blocks of hours; in plain words, without the dietitian's figures.
func TestAthleteFormRaceParts(t *testing.T) {
	for _, name := range []string{"ironman-race.json", "stage-race-4-day.json", "ultra-48h-race.json"} {
		t.Run(name, func(t *testing.T) {
			s, text, pages := athleteSheet(t, name, false)
			if pages < 1 || pages > 4 {
				t.Errorf("%d pages, want 1–4", pages)
			}
			flat := strings.Join(strings.Fields(text), " ")
			for _, w := range append(staffOnly, "kcal", "Stores run low", "speedy") {
				if strings.Contains(text, w) {
					t.Errorf("the athlete's form says %q:\n%s", w, text)
				}
			}
			p := s.Plan
			var want []string
			if de := p.DuringEvent; de != nil && len(p.Stages) == 0 {
				if len(de.Segments) > 0 {
					want = append(want, "Legs of the race")
					for _, seg := range de.Segments {
						want = append(want, legGrams(seg))
					}
				}
				if len(de.Blocks) > 0 {
					want = append(want, "In-event feeding by block of hours")
					for _, b := range de.Blocks {
						want = append(want, b.From.In(mustZone(t, s)).Format("Mon 15:04"))
					}
				}
			}
			if len(p.Stages) > 0 {
				want = append(want, "Stages")
				for _, st := range p.Stages {
					if de := st.DuringEvent; de != nil && de.ChoGPerH > 0 {
						want = append(want, num(de.ChoGPerH, 0)+" g/h ("+num(de.TotalChoG, 0)+" g)")
					}
				}
			}
			if len(want) < 2 {
				t.Fatalf("%s has no legs, stages or blocks to print", name)
			}
			for _, w := range want {
				if !strings.Contains(flat, w) {
					t.Errorf("the athlete's form lacks %q:\n%s", w, text)
				}
			}
		})
	}
}
