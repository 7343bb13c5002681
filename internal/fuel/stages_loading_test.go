package fuel

import (
	"math"
	"strings"
	"testing"
)

// A stage race after a carbohydrate load gives the expected body-mass gain
// as a range, like a one-day event's: glycogen stored with 3–4 g of water
// per g (Olsson & Saltin 1970, as REFERENCES.md cites it), so the top of
// the range is the bottom's (1+4)/(1+3).
func TestStageRaceLoadingMassGainRange(t *testing.T) {
	req := loadRequest(t, "stage-race-4-day.json")
	req.Kind, req.Protocol, req.TaperDays = KindLoading, "two-day", 3
	p := mustCompute(t, req)
	lo, hi := p.ExpectedMassGainKg, p.ExpectedMassGainKgMax
	if lo == nil || hi == nil {
		t.Fatalf("mass gain %v–%v: the range is missing", lo, hi)
	}
	if *lo <= 0 {
		t.Fatalf("a two-day load before a stage race gains %g kg, want more than 0", *lo)
	}
	if want := *lo * 5 / 4; math.Abs(*hi-want) > 0.1 {
		t.Errorf("mass gain %g–%g kg: top %g, want about %.1f (4 instead of 3 g water per g)", *lo, *hi, *hi, want)
	}
	for _, f := range p.Findings {
		if f.Code == "mass-gain" && strings.Contains(f.Message, "about 0 g more glycogen") {
			t.Errorf("mass-gain finding names no glycogen: %s", f.Message)
		}
	}
}
