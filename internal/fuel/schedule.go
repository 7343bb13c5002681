package fuel

import (
	"math"
	"time"
)

// window is a span of time in which no ordinary meal is placed.
type window struct{ from, to time.Time }

// dayPlan is a day before its feeds are laid out: the targets, the feeds
// a protocol fixes (pre-event meal, in-event fuelling, recovery and
// refuelling feeds) and the windows where no ordinary meal goes.
type dayPlan struct {
	day     Day
	date    time.Time
	fixed   []Feed
	blocked []window
	loadDay bool
}

// buildDay turns a day plan into a Day with feeds that add up to its grams.
func (p *planner) buildDay(dp *dayPlan) Day {
	d := dp.day
	mass := p.body.MassKg
	ov := p.dayOverride(d.Date)
	occ := p.occasions
	if dp.loadDay && occ < loadDayOccasions {
		// common practice: load days spread the carbohydrate over more,
		// smaller eating occasions, a late supper included.
		occ = loadDayOccasions
	}
	if ov != nil {
		if ov.ChoGPerKg != nil {
			d.ChoGPerKg = *ov.ChoGPerKg
			d.Overridden = true
		}
		if ov.EatingOccasions != nil {
			occ = *ov.EatingOccasions
			d.Overridden = true
		}
	}
	d.ChoGPerKg = round1(d.ChoGPerKg)
	d.ChoG = math.Round(d.ChoGPerKg * mass)
	var fixedCho, fixedProt float64
	for _, f := range dp.fixed {
		fixedCho += f.ChoG
		fixedProt += f.ProteinG
	}
	if fixedCho > d.ChoG {
		// The protocol's feeds need more than the day's target: the day
		// carries them all (a finding says so).
		d.ChoGPerKg = ceil1(fixedCho / mass)
		d.ChoG = math.Round(d.ChoGPerKg * mass)
	}
	sess := p.sessionsOn(d.Date)
	var exKcal float64
	for _, s := range sess {
		exKcal += s.kcalPerH(p.body) * s.durMin / 60
	}
	exKcal += p.eventKcalOn(&d)
	exKcal = math.Round(exKcal)
	d.ExerciseEnergyKcal = &exKcal
	macros(&d, mass, p.body.FFMKg, exKcal, dp.loadDay)
	// When fat at its upper share still leaves energy availability under
	// the adequate 45 kcal/kg FFM/day (IOC), the carbohydrate rises in
	// 0.5 g/kg steps inside the day's band until it is adequate or at the
	// band's top (a dietitian's carbohydrate override is kept as it is).
	if ov == nil || ov.ChoGPerKg == nil {
		p.raiseForEnergy(&d, exKcal, dp.loadDay)
	}

	// Ordinary eating occasions. The day's eating occasions count all its
	// feeds, the protocol's included: the in-event fuelling counts as one,
	// and so does a run of speedy refuelling feeds. The ordinary meals fill
	// what is left, away from training and from the blocked windows. A day
	// cannot have fewer occasions than the protocol fixes.
	asked := occ
	proto := protocolOccasions(dp.fixed)
	occ = max(occ, proto)
	var slots [16]placedSlot
	nw := p.ordinarySlots(dp, sess, occ-proto, &slots)
	if explicit := p.req.EatingOccasions > 0 || (ov != nil && ov.EatingOccasions != nil); explicit {
		p.noteOccasions(d.Date, asked, proto+nw, dp.fixed)
	}
	n := len(dp.fixed) + nw
	feeds := make([]Feed, 0, n+1)
	feeds = append(feeds, dp.fixed...)
	var weights [16]float64
	var idx [16]int
	for i := 0; i < nw; i++ {
		weights[i] = slots[i].weight
		idx[i] = len(feeds)
		feeds = append(feeds, Feed{At: slots[i].at, Label: slots[i].label})
	}
	restCho := d.ChoG - fixedCho
	if want := p.mealsAfterEventMin(dp, slots[:nw]); restCho < want {
		// The event's feeds used up the day's band: the meals after the
		// finish still get food, and the day grows to carry them.
		d.ChoGPerKg = ceil1((fixedCho + want) / mass)
		d.ChoG = math.Round(d.ChoGPerKg * mass)
		macros(&d, mass, p.body.FFMKg, exKcal, dp.loadDay)
		restCho = d.ChoG - fixedCho
	}
	restProt := math.Max(0, d.ProteinG-fixedProt)
	if nw == 0 && (restCho > 0 || restProt > 0) {
		// Nowhere to put the rest: add it to the last feed after exercise
		// (a recovery or refuelling feed), never to the pre-event meal
		// (its protein, fat and fibre stay low) nor to in-event fuelling.
		// A day inside a race has only its in-event feeds: the day is
		// what they carry. Otherwise make a meal of it.
		placed := false
		for i := len(feeds) - 1; i >= 0; i-- {
			if l := feeds[i].Label; l == labelRecovery || l == labelRefuel {
				feeds[i].ChoG += math.Max(0, restCho)
				feeds[i].ProteinG += restProt
				placed = true
				break
			}
		}
		if !placed && p.inRaceOnly(feeds) {
			p.dayIsItsFeeds(&d, feeds)
			placed = true
		}
		if !placed {
			at, label := p.restMealAt(dp)
			feeds = append(feeds, Feed{At: at, Label: label, ChoG: math.Max(0, restCho), ProteinG: restProt})
		}
	} else if nw > 0 {
		var out [16]float64
		split(restCho, weights[:nw], out[:nw])
		for i := 0; i < nw; i++ {
			feeds[idx[i]].ChoG = out[i]
		}
		split(restProt, weights[:nw], out[:nw])
		for i := 0; i < nw; i++ {
			feeds[idx[i]].ProteinG = out[i]
		}
	}
	var fixed [32]bool
	for i := range dp.fixed {
		if i < len(fixed) {
			fixed[i] = true
		}
	}
	nf := min(len(feeds), len(fixed))
	sortFeeds(feeds[:nf], fixed[:nf])
	d.Feeds = feeds
	p.applyFeedOverrides(&d, dp, fixed[:nf])

	// Energy availability.
	exKcal = *d.ExerciseEnergyKcal
	if p.body.FFMKg > 0 {
		ea := round1((d.EnergyKcal - exKcal) / p.body.FFMKg)
		d.EnergyAvailability = &ea
	}
	if d.Advice == nil {
		d.Advice = []string{}
	}
	return d
}

// placedSlot is an ordinary eating occasion placed on a day.
type placedSlot struct {
	at     time.Time
	label  string
	weight float64
}

// maxOccasions is the largest schedule of ordinary eating occasions.
const maxOccasions = 10

// ordinarySlots places want ordinary eating occasions on a day: the
// default schedule's slots, moved to the end of a session they fall in
// (or 30 min before it) and dropped in blocked windows. When blocked slots
// leave too few, a denser schedule is tried; when there are more than
// wanted, the lightest (snacks, the latest first) go. It returns how many
// were placed (fewer than want only when the day has no room).
func (p *planner) ordinarySlots(dp *dayPlan, sess []sessionInfo, want int, out *[16]placedSlot) int {
	if want <= 0 {
		return 0
	}
	n := 0
	for k := min(want, maxOccasions); k <= maxOccasions; k++ {
		n = 0
		for _, sl := range scheduleFor(k) {
			at := clockOn(dp.date, sl.hhmm)
			for _, s := range sess {
				end := s.start.Add(time.Duration(s.durMin * float64(time.Minute)))
				if !at.Before(s.start.Add(-time.Duration(gMealClear.Max*float64(time.Minute)))) && at.Before(end) {
					at = end
				}
			}
			if blockedAt(dp.blocked, at) || n >= len(out) || (n > 0 && out[n-1].at.Equal(at)) || !at.Before(dp.date.AddDate(0, 0, 1)) {
				continue
			}
			out[n] = placedSlot{at, sl.label, sl.weight}
			n++
		}
		if n >= want {
			break
		}
	}
	for n > want {
		drop := n - 1
		for i := n - 1; i >= 0; i-- {
			if out[i].weight < out[drop].weight {
				drop = i
			}
		}
		copy(out[drop:n], out[drop+1:n])
		n--
	}
	return n
}

// protocolOccasions is how many eating occasions a day's protocol feeds
// make: each is one, except that a run of refuelling feeds is one.
func protocolOccasions(fixed []Feed) int {
	n, refuel := 0, false
	for _, f := range fixed {
		if f.Label == labelRefuel {
			refuel = true
			continue
		}
		n++
	}
	if refuel {
		n++
	}
	return n
}

// fixedKinds names the protocol feeds of a day in plain words.
func fixedKinds(fixed []Feed) string {
	var pre, during, rec, refuel int
	for _, f := range fixed {
		switch f.Label {
		case labelPreEvent:
			pre++
		case labelDuring:
			during++
		case labelRecovery:
			rec++
		case labelRefuel:
			refuel++
		}
	}
	var b []byte
	add := func(n int, one, many string) {
		if n == 0 {
			return
		}
		if len(b) > 0 {
			b = append(b, ", "...)
		}
		if n == 1 {
			b = append(b, one...)
		} else {
			b = appendf(b, "%d "+many, n)
		}
	}
	add(pre, "the pre-event meal", "pre-event meals")
	add(during, "the in-event fuelling", "in-event fuellings")
	add(rec, "a recovery feed", "recovery feeds")
	if refuel > 0 {
		refuel = 1 // one occasion however many feeds
	}
	add(refuel, "the speedy refuelling", "")
	return string(b)
}

// occasionNote is how a day's eating occasions differ from those asked.
type occasionNote struct {
	date              string
	asked, got, fixed int
	kinds             string
}

// noteOccasions records (replacing an earlier build of the same day) when
// a day could not have the eating occasions asked for; finish reports it.
func (p *planner) noteOccasions(date string, asked, got int, fixed []Feed) {
	for i := range p.occNotes {
		if p.occNotes[i].date == date {
			p.occNotes = append(p.occNotes[:i], p.occNotes[i+1:]...)
			break
		}
	}
	if asked == got {
		return
	}
	p.occNotes = append(p.occNotes, occasionNote{date, asked, got, protocolOccasions(fixed), fixedKinds(fixed)})
}

// raiseForEnergy raises a day's carbohydrate in 0.5 g/kg steps inside its
// band while energy availability, with fat at its upper share, stays under
// the adequate 45 kcal/kg FFM/day (IOC). Without fat-free mass it does
// nothing.
func (p *planner) raiseForEnergy(d *Day, exKcal float64, loadDay bool) {
	mass, ffm := p.body.MassKg, p.body.FFMKg
	if ffm <= 0 {
		return
	}
	for d.ChoGPerKg+0.5 <= d.BandMaxGPerKg+1e-9 && (d.EnergyKcal-exKcal)/ffm < gEAAdequate.Min {
		d.ChoGPerKg = round1(math.Floor(d.ChoGPerKg*2+1e-9)/2 + 0.5)
		d.ChoG = math.Round(d.ChoGPerKg * mass)
		macros(d, mass, ffm, exKcal, loadDay)
	}
}

// ceil1 rounds up to one decimal (tolerating float noise).
func ceil1(x float64) float64 { return math.Ceil(x*10-1e-9) / 10 }

func blockedAt(ws []window, t time.Time) bool {
	for _, w := range ws {
		if !t.Before(w.from) && t.Before(w.to) {
			return true
		}
	}
	return false
}

const (
	labelPreEvent = "pre-event meal"
	labelDuring   = "during event"
	labelRecovery = "recovery"
	labelRefuel   = "refuel"
)
