package fuel

import (
	"math"
	"time"
)

// Load bands. A day's training load is its effective minutes: each
// session's duration × an intensity factor ((%VO2max − 35)/30, held
// between 0.3 and 2: easy 0.5, moderate 1, hard 1.5). Under 45 effective
// minutes is light, under 90 moderate ("about 1 h a day"); up to 4 h of
// training and under 300 effective minutes is high ("1–3 h a day of
// moderate to high intensity"), beyond that very high ("over 4–5 h a
// day"). A day
// without training is a rest day on the light band (model assumption
// mapping the published situations onto minutes).
const (
	BandRest     = "rest"
	BandLight    = "light"
	BandModerate = "moderate"
	BandHigh     = "high"
	BandVeryHigh = "very-high"
)

type band struct {
	name string
	g    Guideline
}

var bands = [...]band{
	{BandRest, gBandLight},
	{BandLight, gBandLight},
	{BandModerate, gBandModerate},
	{BandHigh, gBandHigh},
	{BandVeryHigh, gBandVeryHigh},
}

// intensityFactor weighs a session's minutes by intensity
// (model.intensity-factor, held inside model.intensity-factor-clamp).
func intensityFactor(pct float64) float64 {
	return math.Max(gIntClamp.Min, math.Min(gIntClamp.Max, (pct-gIntFactor.Min)/gIntFactor.Max))
}

// dayLoad sums a day's effective minutes and training minutes.
func dayLoad(sessions []sessionInfo) (effMin, trainMin float64) {
	for _, s := range sessions {
		effMin += s.durMin * intensityFactor(s.pct)
		trainMin += s.durMin
	}
	return
}

func bandFor(effMin, trainMin float64) band {
	switch {
	case trainMin == 0:
		return bands[0]
	case effMin < gBandMinutes.Min:
		return bands[1]
	case effMin < gBandMinutes.Max:
		return bands[2]
	case trainMin <= gBandVeryHighM.Min && effMin < gBandVeryHighM.Max:
		return bands[3]
	}
	return bands[4]
}

// bandTarget is the day's target: one line through the load, from 3 g/kg
// at no training through 5 at 45, 6 at 90, 9 at 300 and 12 at 480
// effective minutes (model assumption, in Guidelines), kept inside the day's band and
// rounded down to a practical 0.5 g/kg. One line for all bands keeps more
// training from ever meaning less carbohydrate. Rest days sit at the
// lower end of the light band.
func bandTarget(b band, effMin float64) float64 {
	lo, hi := b.g.Min, b.g.Max
	if b.name == BandRest {
		return lo
	}
	t := targetLine(effMin)
	t = math.Floor(t*2) / 2
	return math.Max(lo, math.Min(hi, t))
}

// lineE and lineG are the knots of the target line (Guidelines
// "model.target-line.N").
var lineE, lineG = func() (e, g [5]float64) {
	for i := range e {
		gl := guideline("model.target-line." + string(rune('0'+i)))
		e[i], g[i] = gl.Min, gl.Max
	}
	return
}()

func targetLine(e float64) float64 {
	if e <= lineE[0] {
		return lineG[0]
	}
	for i := 1; i < len(lineE); i++ {
		if e <= lineE[i] {
			return lineG[i-1] + (e-lineE[i-1])*(lineG[i]-lineG[i-1])/(lineE[i]-lineE[i-1])
		}
	}
	return lineG[len(lineG)-1]
}

// sessionInfo is a parsed training session.
type sessionInfo struct {
	date     string
	start    time.Time
	durMin   float64
	modality string
	pct      float64
	trainLow bool     // kept deliberately unfuelled
	powerW   *float64 // recorded mean power, nil when none
}

// kcalPerH is a session's energy rate: from its mean power when it is a
// cycling session with one (mechanical work at the gross efficiency of
// the guideline table, as for a cycling event), otherwise from VO2max or
// METs at its intensity.
func (s sessionInfo) kcalPerH(b Body) float64 {
	if r, _, ok := paceKcalPerH(b, s.modality, nil, s.powerW, s.durMin); ok {
		return r
	}
	return sessionKcalPerH(b, s.modality, s.pct)
}

// macros fills protein, fat and energy for a day's carbohydrate. Protein is
// 1.6 g/kg (inside 1.2–2.0). When fat-free mass and exercise energy are
// known, energy aims at adequate energy availability (45 kcal/kg FFM/day
// plus the exercise), with fat filling the gap between 20% (22% on load
// days) and 35% of energy — 25% on the event day itself, where the room
// belongs to carbohydrate and a heavy fat load sits badly in the gut;
// otherwise fat is 25% of energy (22% on load days). Energy is the Atwater
// sum of the rounded grams.
func macros(d *Day, massKg, ffmKg, exKcal float64, loadDay bool) {
	d.ProteinG = math.Round(gProteinTarget.Min * massKg)
	floor := gFatShare.Max
	if loadDay {
		floor = gFatShare.Min
	}
	nonFat := gAtwaterCho.Min*d.ChoG + gAtwaterProt.Min*d.ProteinG
	share := floor
	if ffmKg > 0 {
		target := gEAAdequate.Min*ffmKg + exKcal
		upper := gFatUpper.Min
		if d.Role == RoleEvent {
			upper = gFatUpperEvent.Min
		}
		if want := 1 - nonFat/target; want > share {
			share = math.Min(want, math.Max(upper, share))
		}
		if share < gFatFloor.Min+0.02 {
			share = gFatFloor.Min + 0.02
		}
	}
	energy := nonFat / (1 - share)
	d.FatG = math.Ceil(energy * share / gAtwaterFat.Min)
	d.EnergyKcal = math.Round(AtwaterKcal(d.ChoG, d.ProteinG, d.FatG))
}

// slot is a default eating occasion.
type slot struct {
	hhmm   int // minutes after midnight
	label  string
	weight float64 // meals 1, snacks 0.5
}

var schedules = map[int][]slot{
	1: {{12*60 + 30, "lunch", 1}},
	2: {{7*60 + 30, "breakfast", 1}, {18*60 + 30, "dinner", 1}},
	3: {{7*60 + 30, "breakfast", 1}, {12*60 + 30, "lunch", 1}, {18*60 + 30, "dinner", 1}},
	4: {{7*60 + 30, "breakfast", 1}, {12*60 + 30, "lunch", 1}, {15*60 + 30, "snack", 0.5}, {19 * 60, "dinner", 1}},
	5: {{7 * 60, "breakfast", 1}, {10 * 60, "snack", 0.5}, {12*60 + 30, "lunch", 1}, {15*60 + 30, "snack", 0.5}, {19 * 60, "dinner", 1}},
	6: {{7 * 60, "breakfast", 1}, {10 * 60, "snack", 0.5}, {12*60 + 30, "lunch", 1}, {15*60 + 30, "snack", 0.5}, {19 * 60, "dinner", 1}, {21 * 60, "supper", 0.5}},
}

// scheduleFor gives n eating occasions; beyond 6, snacks are spread evenly
// between 07:00 and 21:30 around three meals.
func scheduleFor(n int) []slot {
	if s, ok := schedules[n]; ok {
		return s
	}
	out := make([]slot, n)
	span := (21*60 + 30) - 7*60
	for i := range out {
		// on the quarter hour
		m := 7*60 + (span*i/(n-1)+7)/15*15
		out[i] = slot{m, "snack", 0.5}
	}
	// The three slots nearest breakfast, lunch and dinner are meals.
	for _, meal := range []struct {
		at    int
		label string
	}{{7 * 60, "breakfast"}, {12*60 + 30, "lunch"}, {19 * 60, "dinner"}} {
		best := 0
		for i := range out {
			if abs(out[i].hhmm-meal.at) < abs(out[best].hhmm-meal.at) {
				best = i
			}
		}
		out[best].label, out[best].weight = meal.label, 1
	}
	return out
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

// split shares total grams over weights as whole grams that add up exactly
// (largest remainder), writing into out.
func split(total float64, weights []float64, out []float64) {
	var sum float64
	for _, w := range weights {
		sum += w
	}
	if sum <= 0 || total <= 0 {
		for i := range out {
			out[i] = 0
		}
		return
	}
	t := math.Round(total)
	var given float64
	type rem struct {
		i int
		r float64
	}
	var rems [32]rem
	for i, w := range weights {
		exact := t * w / sum
		out[i] = math.Floor(exact)
		given += out[i]
		if i < len(rems) {
			rems[i] = rem{i, exact - out[i]}
		}
	}
	n := min(len(weights), len(rems))
	left := int(t - given)
	for ; left > 0; left-- {
		best := -1
		for j := 0; j < n; j++ {
			if rems[j].r >= 0 && (best < 0 || rems[j].r > rems[best].r) {
				best = j
			}
		}
		if best < 0 {
			out[n-1]++
			continue
		}
		out[rems[best].i]++
		rems[best].r = -1
	}
}

// clockOn returns the time hh:mm (minutes after midnight) on a date.
func clockOn(date time.Time, minutes int) time.Time {
	y, m, d := date.Date()
	return time.Date(y, m, d, 0, minutes, 0, 0, date.Location())
}

// sortFeeds orders feeds by time, keeping the order of equal times
// (insertion sort: a day has a handful of feeds, and it does not allocate).
// fixed is permuted alongside.
func sortFeeds(f []Feed, fixed []bool) {
	for i := 1; i < len(f); i++ {
		for j := i; j > 0 && f[j].At.Before(f[j-1].At); j-- {
			f[j], f[j-1] = f[j-1], f[j]
			fixed[j], fixed[j-1] = fixed[j-1], fixed[j]
		}
	}
}
