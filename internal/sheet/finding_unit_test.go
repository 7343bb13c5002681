package sheet

import (
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"larder/internal/fuel"
	"larder/internal/mass"
	"larder/internal/sheet/sheettest"
)

// lbOf converts kg to lb by the pound's definition, 0.45359237 kg exactly
// (International Yard and Pound Agreement, 1959), written to 0.1 lb; the
// test's own arithmetic, not the mass package's.
func lbOf(kg float64) string {
	return strconv.FormatFloat(math.Round(kg/0.45359237*10)/10, 'f', 1, 64)
}

// The expected gain from loading is recorded as a figure with the finding,
// and each reader writes it in the client's unit: lb for a client weighed in
// pounds, kg otherwise, on the sheet as in the message.
func TestMassGainFindingInClientUnit(t *testing.T) {
	req, plan := example(t, "marathon-loading.json")
	if plan.ExpectedMassGainKg == nil || plan.ExpectedMassGainKgMax == nil {
		t.Fatal("the loading example gives no expected gain")
	}
	lo, hi := *plan.ExpectedMassGainKg, *plan.ExpectedMassGainKgMax
	var gain *fuel.Finding
	for i, fd := range plan.Findings {
		if fd.Code == "mass-gain" {
			gain = &plan.Findings[i]
		}
	}
	if gain == nil {
		t.Fatal("no mass-gain finding")
	}
	if len(gain.Masses) != 1 || gain.Masses[0].Kg != lo || gain.Masses[0].MaxKg != hi {
		t.Fatalf("finding's figures %+v, want %g–%g kg", gain.Masses, lo, hi)
	}

	wantLb := lbOf(lo) + "–" + lbOf(hi) + " lb above the usual diet"
	inLb := FindingMessage(*gain, mass.LB)
	if !strings.Contains(inLb, wantLb) || strings.Contains(inLb, " kg") {
		t.Errorf("lb client reads %q, want %q and no kg", inLb, wantLb)
	}
	wantKg := strconv.FormatFloat(lo, 'f', 1, 64) + "–" + strconv.FormatFloat(hi, 'f', 1, 64) + " kg above the usual diet"
	if inKg := FindingMessage(*gain, mass.KG); !strings.Contains(inKg, wantKg) || strings.Contains(inKg, " lb") {
		t.Errorf("kg client reads %q, want %q", inKg, wantKg)
	}
	// The rest of the message stays as the engine wrote it.
	if !strings.HasPrefix(inLb, "Expect body mass at the start to be about ") || !strings.HasSuffix(inLb, "Expected, not a sign of fat gain.") {
		t.Errorf("message around the figure changed: %q", inLb)
	}

	for _, u := range []mass.Unit{mass.LB, mass.KG} {
		s := sheetFor(req, plan, StatusPublished)
		s.MassUnit = u
		pdf, err := Render(s, A4)
		if err != nil {
			t.Fatal(err)
		}
		text, ok := sheettest.Text(t, pdf)
		if !ok {
			t.Skip("pdftotext not installed")
		}
		want, not := wantLb, " kg above the usual diet"
		if u == mass.KG {
			want, not = wantKg, " lb above the usual diet"
		}
		if !strings.Contains(text, want) || strings.Contains(text, not) {
			t.Errorf("%s sheet lacks %q (or has %q)", u, want, not)
		}
	}
}

// Every body mass any example's findings name is carried as a figure: in lb
// no kg figure is left in the message, and the pieces around the figures
// join back into the engine's kg message.
func TestFindingFiguresEveryExample(t *testing.T) {
	names, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "fuel", "*.json"))
	if len(names) == 0 {
		t.Fatal("no examples")
	}
	seen := 0
	for _, path := range names {
		if _, err := os.Stat(path); err != nil {
			t.Fatal(err)
		}
		_, plan := example(t, filepath.Base(path))
		for _, fd := range plan.Findings {
			if len(fd.Masses) == 0 {
				if strings.Contains(fd.Message, " kg ") || strings.Contains(fd.Message, " kg)") {
					t.Errorf("%s: %s names a mass in kg without its figure: %q", filepath.Base(path), fd.Code, fd.Message)
				}
				continue
			}
			seen++
			if len(fd.MassText) != len(fd.Masses)+1 {
				t.Fatalf("%s: %d pieces for %d figures", fd.Code, len(fd.MassText), len(fd.Masses))
			}
			inLb := FindingMessage(fd, mass.LB)
			for _, m := range fd.Masses {
				if !strings.Contains(inLb, lbOf(m.Kg)) {
					t.Errorf("%s: %q lacks %s lb", fd.Code, inLb, lbOf(m.Kg))
				}
			}
			if strings.Contains(inLb, " kg") {
				t.Errorf("%s: a kg figure is left in %q", fd.Code, inLb)
			}
		}
	}
	if seen == 0 {
		t.Fatal("no example's findings name a body mass")
	}
}
