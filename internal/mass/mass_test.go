package mass

import (
	"math"
	"testing"
)

func TestPoundIsTheInternationalPound(t *testing.T) {
	// 1 lb = 0.45359237 kg exactly (International Yard and Pound Agreement,
	// 1959; NIST SP 811, appendix B.9): 100 lb = 45.359237 kg, 1 kg = 2.20462 lb.
	if got := ToKg(100, LB); math.Abs(got-45.359237) > 1e-9 {
		t.Fatalf("100 lb = %v kg", got)
	}
	if got := FromKg(1, LB); math.Abs(got-2.20462262) > 1e-8 {
		t.Fatalf("1 kg = %v lb", got)
	}
	if ToKg(70, KG) != 70 || FromKg(70, KG) != 70 {
		t.Fatal("kg is not kg")
	}
}

// Every value a lb scale shows (0.1 lb steps over the whole accepted range),
// stored as kg to 0.01 and shown again in lb, comes back as typed, and saving
// the shown value again stores the same kg.
func TestPoundsRoundTripWithoutDrift(t *testing.T) {
	lo, hi := Range(LB)
	n := 0
	for tenth := int(math.Round(lo * 10)); tenth <= int(math.Round(hi*10)); tenth++ {
		typed := float64(tenth) / 10
		kg, ok := Check(typed, LB)
		if !ok {
			t.Fatalf("%.1f lb (%v kg) refused though within %s", typed, kg, RangeText(LB))
		}
		shown := Input(kg, LB)
		if want := num(typed, 1); shown != want {
			t.Fatalf("%.1f lb stored as %v kg shows as %s lb", typed, kg, shown)
		}
		if again := Reread(typed, LB, kg); again != kg {
			t.Fatalf("%.1f lb saved again moved %v kg to %v kg", typed, kg, again)
		}
		if again := StoredKg(typed, LB); again != kg {
			t.Fatalf("%.1f lb converted again gives %v kg, not %v", typed, again, kg)
		}
		n++
	}
	if n < 6000 {
		t.Fatalf("only %d values checked", n)
	}
}

func TestRereadKeepsAnUnchangedMass(t *testing.T) {
	// 68.00 kg typed in kg is 149.9 lb on a lb form; re-sent unchanged it
	// stays 68.00 kg rather than becoming 149.9 lb = 67.99 kg.
	if got := Reread(149.9, LB, 68); got != 68 {
		t.Fatalf("unchanged 149.9 lb reread as %v kg", got)
	}
	if got := Reread(150, LB, 68); got != 68.04 {
		t.Fatalf("150 lb reread as %v kg, want 68.04", got)
	}
	if got := Reread(68.5, KG, 68); got != 68.5 {
		t.Fatalf("68.5 kg reread as %v", got)
	}
	if got := Reread(150, LB, 0); got != 68.04 {
		t.Fatalf("150 lb with nothing on record read as %v kg", got)
	}
}

func TestOneRangeInEitherUnit(t *testing.T) {
	// 20 kg = 44.09 lb and 300 kg = 661.39 lb: stated inwards to 0.1 lb so
	// that both ends typed as stated are accepted.
	if lo, hi := Range(LB); lo != 44.1 || hi != 661.3 {
		t.Fatalf("lb range %v–%v", lo, hi)
	}
	if lo, hi := Range(KG); lo != 20 || hi != 300 {
		t.Fatalf("kg range %v–%v", lo, hi)
	}
	for _, c := range []struct {
		v  float64
		u  Unit
		ok bool
	}{{20, KG, true}, {19.99, KG, false}, {300, KG, true}, {300.01, KG, false},
		{44.1, LB, true}, {44, LB, false}, {661.3, LB, true}, {661.5, LB, false}} {
		if _, ok := Check(c.v, c.u); ok != c.ok {
			t.Errorf("%v %s accepted=%v, want %v", c.v, c.u, ok, c.ok)
		}
	}
	if got := RangeMessage(LB); got != "Body mass must be between 44.1 and 661.3 lb (20 to 300 kg)." {
		t.Errorf("lb message: %s", got)
	}
	if got := RangeMessage(KG); got != "Body mass must be between 20 and 300 kg." {
		t.Errorf("kg message: %s", got)
	}
}

func TestText(t *testing.T) {
	for _, c := range []struct {
		kg   float64
		u    Unit
		want string
	}{{68.22, KG, "68.2 kg"}, {68.22, LB, "150.4 lb"}, {70, LB, "154.3 lb"}, {58, KG, "58.0 kg"}} {
		if got := Text(c.kg, c.u); got != c.want {
			t.Errorf("Text(%v, %s) = %q, want %q", c.kg, c.u, got, c.want)
		}
	}
	if got := Difference(1.2, 2.0, LB); got != "2.6–4.4 lb" {
		t.Errorf("Difference = %q", got)
	}
	if got := Difference(1.2, 1.2, KG); got != "1.2 kg" {
		t.Errorf("Difference = %q", got)
	}
	if got := Precise(61, KG) + ", " + Precise(68.22, KG) + ", " + Precise(68.22, LB); got != "61 kg, 68.22 kg, 150.4 lb" {
		t.Errorf("Precise = %q", got)
	}
	if got := Input(68.2, KG); got != "68.2" {
		t.Errorf("Input kg = %q", got)
	}
	if Or("", LB) != LB || Or("kg", LB) != KG || Or("stone", "") != KG {
		t.Error("Or does not fall back")
	}
}
