package fuel

import (
	"math"
	"testing"
)

func TestGuidelineTableIsWellFormed(t *testing.T) {
	seen := map[string]bool{}
	for _, g := range Guidelines {
		if seen[g.Key] {
			t.Errorf("duplicate guideline key %q", g.Key)
		}
		seen[g.Key] = true
		if g.Description == "" || g.Unit == "" {
			t.Errorf("%s: description and unit are required", g.Key)
		}
		if math.IsNaN(g.Min) || math.IsNaN(g.Max) {
			t.Errorf("%s: NaN", g.Key)
		}
	}
}

// TestGuidelineValuesMatchReferences checks the table's published values
// one by one against REFERENCES.md, each with its source.
func TestGuidelineValuesMatchReferences(t *testing.T) {
	cases := []struct {
		key      string
		min, max float64
		source   string
	}{
		// ACSM/AND/DC 2016 joint position statement; Burke et al. 2011
		{"band.light", 3, 5, "ACSM/AND/DC 2016 joint position statement; Burke et al. 2011"},
		{"band.moderate", 5, 7, "ACSM/AND/DC 2016 joint position statement; Burke et al. 2011"},
		{"band.high", 6, 10, "ACSM/AND/DC 2016 joint position statement; Burke et al. 2011"},
		{"band.very-high", 8, 12, "ACSM/AND/DC 2016 joint position statement; Burke et al. 2011"},
		// ACSM/AND/DC 2016
		{"fuelling-up", 7, 12, "ACSM/AND/DC 2016"},
		{"loading.two-day", 10, 12, "ACSM/AND/DC 2016"},
		{"loading.event-min", 90, 90, "ACSM/AND/DC 2016"},
		// Sedlock DA. ... 2008
		{"loading.women-bm", 8, 8, "Sedlock DA. The latest on carbohydrate loading. Curr Sports Med Rep 2008;7(4):209–213"},
		{"loading.women-ffm", 10, 10, "Sedlock DA. The latest on carbohydrate loading. Curr Sports Med Rep 2008;7(4):209–213"},
		// Bussau VA et al. 2002 (from memory)
		{"loading.one-day", 10, 10, "Bussau VA et al. Eur J Appl Physiol 2002;87:290–295 (from memory)"},
		// ACSM/AND/DC 2016
		{"repletion.speedy-gap", 8, 8, "ACSM/AND/DC 2016"},
		{"repletion.rate", 1.0, 1.2, "ACSM/AND/DC 2016"},
		{"repletion.window", 4, 4, "ACSM/AND/DC 2016"},
		{"pre-event.cho", 1, 4, "ACSM/AND/DC 2016"},
		{"pre-event.hours", 1, 4, "ACSM/AND/DC 2016"},
		{"pre-event.event-min", 60, 60, "ACSM/AND/DC 2016"},
		{"during.none", 0, 45, "ACSM/AND/DC 2016"},
		{"during.small", 45, 75, "ACSM/AND/DC 2016"},
		// ACSM/AND/DC 2016; Jeukendrup AE. Sports Med 2014
		{"during.30-60", 30, 60, "ACSM/AND/DC 2016; Jeukendrup AE. Sports Med 2014;44 Suppl 1:S25–S33"},
		{"during.30-60-time", 75, 150, "ACSM/AND/DC 2016; Jeukendrup AE. Sports Med 2014;44 Suppl 1:S25–S33"},
		{"during.up-to-90", 30, 90, "ACSM/AND/DC 2016; Jeukendrup AE. Sports Med 2014;44 Suppl 1:S25–S33"},
		// common practice
		{"during.hard-cover", 0.35, 0.35, "common practice"},
		// ACSM/AND/DC 2016
		{"protein.daily", 1.2, 2.0, "ACSM/AND/DC 2016"},
		{"protein.meal", 0.3, 0.3, "ACSM/AND/DC 2016"},
		{"repletion.protein", 0.3, 0.3, "ACSM/AND/DC 2016"},
		{"fat.floor", 0.20, 0.20, "ACSM/AND/DC 2016"},
		// van Loon LJ et al. 2000 (from memory)
		{"repletion.cho-protein", 0.8, 1.2, "van Loon LJ et al. Am J Clin Nutr 2000;72:106–111 (from memory)"},
		// Ivy JL et al. 1988 (from memory)
		{"repletion.delay-2h", 0.5, 0.5, "Ivy JL et al. J Appl Physiol 1988;64:1480–1485 (from memory)"},
		// IOC consensus statement on REDs
		{"ea.low", 30, 30, "IOC consensus statement on REDs (Mountjoy M et al. Br J Sports Med 2018;52:687–697; 2023 update)"},
		{"ea.adequate", 45, 45, "IOC consensus statement on REDs (Mountjoy M et al. Br J Sports Med 2018;52:687–697; 2023 update)"},
		// IUPAC standard atomic weights
		{"glucosyl.g-per-mmol", 0.162, 0.162, "IUPAC standard atomic weights"},
		// common practice
		{"liver.fed-70kg", 100, 120, "common practice"},
		{"muscle.70kg", 400, 400, "common practice"},
		{"liver.fed-hours", 8, 12, "common practice"},
		// Olsson KE, Saltin B. 1970 (from memory); range is common practice
		{"glycogen.water", 3, 4, "Olsson KE, Saltin B. Acta Physiol Scand 1970;80:11–18 (from memory)"},
		// Bergström J et al. 1967; Sherman WM et al. 1981 (from memory)
		{"density.depleted", 25, 40, "Bergström J et al. Acta Physiol Scand 1967;71:140–150; Sherman WM et al. Int J Sports Med 1981;2:114–118 (from memory)"},
		{"density.typical", 80, 120, "Bergström J et al. Acta Physiol Scand 1967;71:140–150; Sherman WM et al. Int J Sports Med 1981;2:114–118 (from memory)"},
		{"density.loaded", 150, 200, "Bergström J et al. Acta Physiol Scand 1967;71:140–150; Sherman WM et al. Int J Sports Med 1981;2:114–118 (from memory)"},
		// Jentjens R, Jeukendrup AE. 2003 (from memory)
		{"resynthesis.max", 5, 8, "Jentjens R, Jeukendrup AE. Sports Med 2003;33(2):117–144 (from memory)"},
		// Janssen I et al. 2000
		{"muscle.share.male", 0.384, 0.384, "Janssen I et al. J Appl Physiol 2000;89:81–88"},
		{"muscle.share.female", 0.306, 0.306, "Janssen I et al. J Appl Physiol 2000;89:81–88"},
		// Rapoport BI. 2010
		{"legs.share.male", 0.21, 0.21, "Rapoport BI. PLoS Comput Biol 2010;6(10):e1000960"},
		{"legs.share.female", 0.20, 0.20, "Rapoport BI. PLoS Comput Biol 2010;6(10):e1000960"},
		{"legs.loaded-kcal", 144, 144, "Rapoport 2010"},
		// Rapoport 2010; common practice
		{"run.kcal-per-kg-km", 1, 1, "Rapoport 2010; common practice"},
		{"marathon.wall", 30, 35, "Rapoport 2010; common practice"},
		// common practice
		{"cycle.kj-per-kcal", 0.24, 0.24, "common practice"},
		// Weir JB. 1949 (coefficients of VO2 and VCO2)
		{"weir", 3.941, 1.106, "Weir JB. J Physiol 1949;109:1–9"},
		// Frayn KN. 1983
		{"frayn.cho", 4.55, 3.21, "Frayn KN. J Appl Physiol 1983;55:628–634"},
		{"frayn.fat", 1.67, 1.67, "Frayn KN. J Appl Physiol 1983;55:628–634"},
		// Romijn JA et al. 1993 (from memory, shape only)
		{"share.65", 65, 0.50, "Romijn JA et al. Am J Physiol 1993;265:E380–E391 (from memory, shape only)"},
		{"share.85", 85, 0.75, "Romijn JA et al. Am J Physiol 1993;265:E380–E391 (from memory, shape only)"},
		// Atwater general factors (FAO 2003 food energy report)
		{"atwater.cho", 4, 4, "Atwater general factors (FAO 2003 food energy report)"},
		{"atwater.protein", 4, 4, "Atwater general factors (FAO 2003 food energy report)"},
		{"atwater.fat", 9, 9, "Atwater general factors (FAO 2003 food energy report)"},
		{"atwater.alcohol", 7, 7, "Atwater general factors (FAO 2003 food energy report)"},
		{"kj-per-kcal", 4.184, 4.184, "Atwater general factors (FAO 2003 food energy report)"},
		// Ainsworth BE et al. 2011
		{"met", 1, 3.5, "Ainsworth BE et al. 2011 Compendium of Physical Activities, Med Sci Sports Exerc 2011;43:1575–1581"},
	}
	for _, c := range cases {
		g := guideline(c.key)
		if g.Min != c.min || g.Max != c.max {
			t.Errorf("%s = %g–%g, REFERENCES.md says %g–%g", c.key, g.Min, g.Max, c.min, c.max)
		}
		if g.Source != c.source {
			t.Errorf("%s: source %q, want %q", c.key, g.Source, c.source)
		}
	}
}

// TestModelChoicesSitInsidePublishedRanges: the engine's own points must lie
// inside the published ranges they pick from.
func TestModelChoicesSitInsidePublishedRanges(t *testing.T) {
	within := func(name string, v, lo, hi float64) {
		t.Helper()
		if v < lo || v > hi {
			t.Errorf("%s = %g, outside %g–%g", name, v, lo, hi)
		}
	}
	// Bergström J et al. Acta Physiol Scand 1967;71:140–150; Sherman WM et al. Int J Sports Med 1981;2:114–118 (from memory): typical trained 80–120
	within("typical density", gModelTypical.Min, 80, 120)
	// same source: loaded 150–200+; the asymptote sits just above the range's top
	within("capacity density", gModelCapacity.Min, 200, 230)
	// The synthesis constants are not observed rates themselves (the peak is
	// the rate of empty muscle just after exercise with unlimited supply);
	// the rates they give are checked against the studies in
	// calibration_test.go.
	// ACSM/AND/DC 2016: 1.2–2.0 g/kg/day protein
	within("protein target", gProteinTarget.Min, 1.2, 2.0)
	// ACSM/AND/DC 2016: 10–12 g/kg per 24 h loading
	within("two-day load target", gLoadTwoDay.Min, 10, 12)
	within("other load target", gLoadOther.Min, 10, 12)
	// ACSM/AND/DC 2016: fat not below 20% of energy
	within("fat share (load days)", gFatShare.Min, 0.20, 1)
	// common practice: liver 100–120 g at 70 kg
	within("liver capacity at 70 kg", gModelLiver.Min*70, 100, 120)
	// common practice: 60–90 g/h over 2.5 h is inside ACSM/AND/DC 2016; Jeukendrup AE. Sports Med 2014;44 Suppl 1:S25–S33 "up to 90"
	within("long-event floor", gLongFloor.Min, 30, 90)
}
