package fuel

import (
	"testing"
	"time"
)

// TestLoadBands places days of training in the published bands:
// ACSM/AND/DC 2016 joint position statement; Burke et al. 2011 —
// light 3–5 (low-intensity or skill-based), moderate 5–7 (moderate exercise
// about 1 h a day), high 6–10 (1–3 h a day of moderate to high intensity),
// very high 8–12 (over 4–5 h a day).
func TestLoadBands(t *testing.T) {
	cases := []struct {
		name     string
		sessions []sessionInfo
		band     string
		lo, hi   float64
	}{
		{"rest day", nil, BandRest, 3, 5},
		{"30 min easy skill work", []sessionInfo{{durMin: 30, pct: 50}}, BandLight, 3, 5},
		{"1 h moderate", []sessionInfo{{durMin: 60, pct: 65}}, BandModerate, 5, 7},
		{"75 min moderate", []sessionInfo{{durMin: 75, pct: 65}}, BandModerate, 5, 7},
		{"90 min moderate", []sessionInfo{{durMin: 90, pct: 65}}, BandHigh, 6, 10},
		{"2 h moderate", []sessionInfo{{durMin: 120, pct: 65}}, BandHigh, 6, 10},
		{"3 h hard", []sessionInfo{{durMin: 180, pct: 80}}, BandHigh, 6, 10},
		{"two sessions, 2 h in all, hard", []sessionInfo{{durMin: 60, pct: 80}, {durMin: 60, pct: 80}}, BandHigh, 6, 10},
		{"4.5 h moderate", []sessionInfo{{durMin: 270, pct: 65}}, BandVeryHigh, 8, 12},
		{"5 h in two sessions", []sessionInfo{{durMin: 180, pct: 65}, {durMin: 120, pct: 65}}, BandVeryHigh, 8, 12},
	}
	for _, c := range cases {
		eff, tm := dayLoad(c.sessions)
		b := bandFor(eff, tm)
		if b.name != c.band {
			t.Errorf("%s: band %q, want %q", c.name, b.name, c.band)
			continue
		}
		if b.g.Min != c.lo || b.g.Max != c.hi {
			t.Errorf("%s: band range %g–%g, want %g–%g", c.name, b.g.Min, b.g.Max, c.lo, c.hi)
		}
		target := bandTarget(b, eff)
		if target < c.lo || target > c.hi {
			t.Errorf("%s: target %g outside %g–%g", c.name, target, c.lo, c.hi)
		}
		// common practice: targets are practical amounts, here multiples of 0.5 g/kg
		if target*2 != float64(int(target*2)) {
			t.Errorf("%s: target %g is not a multiple of 0.5 g/kg", c.name, target)
		}
	}
}

func TestTargetsRiseWithLoad(t *testing.T) {
	// ACSM/AND/DC 2016 joint position statement; Burke et al. 2011: more training, more carbohydrate.
	prev := 0.0
	for min := 0.0; min <= 600; min += 5 {
		var s []sessionInfo
		if min > 0 {
			s = []sessionInfo{{durMin: min, pct: 65}}
		}
		eff, tm := dayLoad(s)
		got := bandTarget(bandFor(eff, tm), eff)
		if got < prev {
			t.Errorf("%g min: target %g below %g for less training", min, got, prev)
		}
		prev = got
	}
}

func TestIntensityWords(t *testing.T) {
	cases := []struct {
		in   string
		pct  float64
		fail bool
	}{
		{"easy", 50, false}, {"moderate", 65, false}, {"hard", 80, false},
		{"rpe:7", 75, false}, {"rpe:10", 90, false}, {"pct:70", 70, false},
		{"rpe:11", 0, true}, {"pct:10", 0, true}, {"fast", 0, true}, {"rpe:", 0, true}, {"pct:abc", 0, true},
	}
	for _, c := range cases {
		in, err := parseIntensity(c.in)
		if c.fail {
			if err == nil {
				t.Errorf("%q: accepted, want an error", c.in)
			}
			continue
		}
		if err != nil {
			t.Errorf("%q: %v", c.in, err)
			continue
		}
		if got := intensityPct(in); got != c.pct {
			t.Errorf("%q: %g%% VO2max, want %g", c.in, got, c.pct)
		}
	}
}

func TestSplitAddsUpExactly(t *testing.T) {
	var out [8]float64
	for _, total := range []float64{0, 1, 7, 100, 609, 611.4, 999} {
		w := []float64{1, 0.5, 1, 0.5, 1, 0.5, 0.5}
		split(total, w, out[:len(w)])
		var sum float64
		for _, g := range out[:len(w)] {
			if g < 0 || g != float64(int(g)) {
				t.Errorf("total %g: share %g is not a whole, non-negative gram", total, g)
			}
			sum += g
		}
		if want := float64(int(total + 0.5)); sum != want {
			t.Errorf("total %g: shares add to %g, want %g", total, sum, want)
		}
	}
}

func TestScheduleTimes(t *testing.T) {
	// common practice: breakfast about 07:00 and the last eating occasion by about 21:30.
	for n := 1; n <= 10; n++ {
		s := scheduleFor(n)
		if len(s) != n {
			t.Fatalf("%d occasions: got %d", n, len(s))
		}
		for i, sl := range s {
			if sl.hhmm < 7*60 || sl.hhmm > 21*60+30 {
				t.Errorf("%d occasions: slot %d at %02d:%02d outside 07:00–21:30", n, i, sl.hhmm/60, sl.hhmm%60)
			}
			if i > 0 && sl.hhmm <= s[i-1].hhmm {
				t.Errorf("%d occasions: slots out of order", n)
			}
		}
	}
	day := time.Date(2027, 4, 16, 0, 0, 0, 0, time.FixedZone("", 2*3600))
	if got := clockOn(day, 7*60+30).Format(time.RFC3339); got != "2027-04-16T07:30:00+02:00" {
		t.Errorf("clockOn: %s", got)
	}
}

// On the event day fat stays between the 20% floor (ACSM/AND/DC 2016) and a
// moderate quarter of energy (common practice: carbohydrate gets the room on
// race day), even when energy availability then falls short — that shortfall
// is reported as a note, not filled with fat.
func TestEventDayFatStaysModerate(t *testing.T) {
	for _, name := range []string{"marathon-loading.json", "cyclist-5h-race.json", "night-trail-race.json"} {
		p := mustCompute(t, loadRequest(t, name))
		seen := false
		for _, d := range p.Days {
			if d.Role != RoleEvent {
				continue
			}
			seen = true
			share := 9 * d.FatG / d.EnergyKcal
			if share < 0.20 || share > 0.255 {
				t.Errorf("%s %s: fat %g g is %.1f%% of %g kcal, want 20–25%%", name, d.Date, d.FatG, 100*share, d.EnergyKcal)
			}
		}
		if !seen {
			t.Errorf("%s: no event day", name)
		}
	}
}
