package fuel

import (
	"fmt"
	"math"
	"time"
)

const feedOvApplied = "applied"

// Roles of plan days.
const (
	RoleTaper     = "taper"
	RoleLoad      = "load"
	RoleEvent     = "event"
	RoleRecovery  = "recovery"
	RoleTraining  = "training"
	RoleRepletion = "repletion"
)

// Protocols of carbohydrate loading.
const (
	ProtocolTwoDay   = "two-day"
	ProtocolOneDay   = "one-day"
	ProtocolThreeDay = "three-day"
)

// Caution is the safety text every plan carries (DESIGN.md, Safety).
const Caution = "This plan is a professional's tool, not medical advice. Individual needs vary; " +
	"athletes with diabetes, kidney disease, an eating disorder history, pregnancy, or gut disease " +
	"need individual clinical care. Try any race fuelling in training first. " +
	"Follow local regulations and licensed practice."

const (
	defaultOccasions = 5
	loadDayOccasions = 6
)

// planner carries one computation.
type planner struct {
	req       Request
	body      Body
	sb        simBody
	loc       *time.Location
	plan      Plan
	sessions  []sessionInfo
	occasions int
	modality  string

	// event figures (loading and race)
	ev        *Event
	evStart   time.Time
	evEnd     time.Time
	evDurH    float64
	evPct     float64
	evUseGPH  float64
	evCover   float64
	evKcal    float64
	evShare   float64
	evMethod  string
	evDayDate string

	feedOvState  []string // per feed override: feedOvApplied, or why it was not
	buf          []byte   // message buffer of find
	startDensity float64  // working-muscle glycogen at the start line, mmol/kg
	repWinH      float64  // speedy refuelling window, hours
	occNotes     []occasionNote
	start        simState // startState, once computed
	haveStart    bool
	preMealNight bool // the pre-event meal could only go in the night hours
}

// Compute builds the plan a request asks for. Bad input yields a
// ValidationError; the computation itself does not fail on valid input.
func Compute(req Request) (Plan, error) {
	if err := req.Validate(); err != nil {
		return Plan{}, err
	}
	p := &planner{req: req}
	p.setup()
	switch req.Kind {
	case KindLoading:
		p.loading()
	case KindRace:
		p.race()
	case KindRepletion:
		p.repletion()
	case KindWeek:
		p.week()
	}
	p.finish()
	return p.plan, nil
}

func (p *planner) setup() {
	req := p.req
	p.loc = time.UTC
	switch {
	case req.TimeZone != "":
		p.loc, _ = loadLocation(req.TimeZone) // validated
	case req.Event != nil:
		p.loc = req.Event.StartsAt.Location()
	case req.SessionEnd != nil:
		p.loc = req.SessionEnd.Location()
	}
	p.occasions = defaultOccasions
	if req.EatingOccasions > 0 {
		p.occasions = req.EatingOccasions
	}
	p.modality = "other"
	if req.Event != nil {
		p.modality = req.Event.Modality
	} else if len(req.Training) > 0 && req.Training[0].Modality != "" {
		p.modality = req.Training[0].Modality
	}
	p.body = NewBody(req.Athlete, p.modality)
	p.sb = newSimBody(p.body)
	p.sessions = make([]sessionInfo, 0, len(req.Training))
	for _, t := range req.Training {
		d, err := time.ParseInLocation("2006-01-02", t.Date, p.loc)
		if err != nil {
			continue // validated
		}
		startMin := int(gSessionStart.Min * 60)
		if t.Start != "" {
			if c, err := time.Parse("15:04", t.Start); err == nil {
				startMin = c.Hour()*60 + c.Minute()
			}
		}
		in := Intensity{Word: "moderate"}
		if t.Intensity != "" {
			in, _ = parseIntensity(t.Intensity)
		}
		mod := t.Modality
		if mod == "" {
			mod = p.modality
		}
		s := sessionInfo{date: t.Date, start: clockOn(d, startMin), durMin: t.DurationMin, modality: mod, pct: intensityPct(in)}
		// keep sorted by start
		i := len(p.sessions)
		p.sessions = append(p.sessions, s)
		for ; i > 0 && p.sessions[i].start.Before(p.sessions[i-1].start); i-- {
			p.sessions[i], p.sessions[i-1] = p.sessions[i-1], p.sessions[i]
		}
	}
	p.plan = Plan{
		Kind:              req.Kind,
		TimeZone:          zoneName(p.loc, req),
		BodyMassKg:        req.Athlete.BodyMassKg,
		FatFreeMassKg:     round1(p.body.FFMKg),
		FatFreeMassMethod: p.body.FFMMethod,
		Findings:          make([]Finding, 0, 64),
		Caution:           Caution,
	}
	if req.Event != nil {
		p.eventFigures()
	}
}

// zoneName names the plan's zone: the IANA name, or the offset (like
// "+02:00") when times carry only an offset.
func zoneName(loc *time.Location, req Request) string {
	if n := loc.String(); n != "" {
		return n
	}
	var t time.Time
	switch {
	case req.Event != nil:
		t = req.Event.StartsAt
	case req.SessionEnd != nil:
		t = *req.SessionEnd
	}
	return t.Format("-07:00")
}

// eventFigures computes the event's energy, carbohydrate share and use.
func (p *planner) eventFigures() {
	e := p.req.Event
	p.ev = e
	p.evStart = e.StartsAt.In(p.loc)
	p.evDurH = e.ExpectedDurationMin / 60
	p.evEnd = p.evStart.Add(time.Duration(e.ExpectedDurationMin * float64(time.Minute)))
	p.evDayDate = p.evStart.Format("2006-01-02")
	p.evPct = defaultRaceIntensity(e.ExpectedDurationMin)
	if e.IntensityPctVO2max != nil {
		p.evPct = *e.IntensityPctVO2max
	}
	p.evKcal, p.evMethod = EventEnergy(p.body, *e, p.evPct)
	p.evShare = ChoShare(p.evPct)
	p.evUseGPH = p.evKcal / p.evDurH * p.evShare / gAtwaterCho.Min
	p.evCover = coverShare(p.evPct)
}

func (p *planner) sessionsOn(date string) []sessionInfo {
	lo, hi := -1, -1
	for i, s := range p.sessions {
		if s.date == date {
			if lo < 0 {
				lo = i
			}
			hi = i + 1
		}
	}
	if lo < 0 {
		return nil
	}
	return p.sessions[lo:hi]
}

func (p *planner) dayOverride(date string) *DayOverride {
	for i := range p.req.Overrides {
		if p.req.Overrides[i].Date == date {
			return &p.req.Overrides[i]
		}
	}
	return nil
}

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
		exKcal += sessionKcalPerH(p.body, s.modality, s.pct) * s.durMin / 60
	}
	if d.Role == RoleEvent && p.ev != nil {
		exKcal += p.evKcal
	}
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
	restProt := math.Max(0, d.ProteinG-fixedProt)
	if nw == 0 && (restCho > 0 || restProt > 0) {
		// Nowhere to put the rest: add it to the last fixed feed that is not
		// in-event fuelling, or make a meal of it.
		placed := false
		for i := len(feeds) - 1; i >= 0; i-- {
			if feeds[i].Label != labelDuring {
				feeds[i].ChoG += math.Max(0, restCho)
				feeds[i].ProteinG += restProt
				placed = true
				break
			}
		}
		if !placed {
			feeds = append(feeds, Feed{At: clockOn(dp.date, 12*60+30), Label: "lunch", ChoG: math.Max(0, restCho), ProteinG: restProt})
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
				if !at.Before(s.start.Add(-30*time.Minute)) && at.Before(end) {
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

// applyFeedOverrides sets the dietitian's feed times and grams, then
// shares what is left of the day's grams over the feeds not overridden
// (protocol feeds keep their grams). When the overrides alone exceed the
// day's grams, the day grows to their sum and is marked overridden.
func (p *planner) applyFeedOverrides(d *Day, dp *dayPlan, fixed []bool) {
	any := false
	for i, o := range p.req.FeedOverrides {
		if o.Date != d.Date {
			continue
		}
		if p.feedOvState == nil {
			p.feedOvState = make([]string, len(p.req.FeedOverrides))
		}
		if o.Index >= len(d.Feeds) || o.Index >= len(fixed) {
			p.feedOvState[i] = fmt.Sprintf("Feed override %d for %s names feed %d, but the day has %d feeds; it was not applied.",
				i, d.Date, o.Index, len(d.Feeds))
			continue
		}
		f := &d.Feeds[o.Index]
		if f.Label == labelDuring {
			p.feedOvState[i] = fmt.Sprintf("Feed %d on %s is the in-event fuelling; change it with during_event_cho_g_per_h instead.", o.Index, d.Date)
			continue
		}
		p.feedOvState[i] = feedOvApplied
		if o.At != "" {
			if c, err := time.Parse("15:04", o.At); err == nil {
				f.At = clockOn(dp.date, c.Hour()*60+c.Minute())
			}
		}
		if o.ChoG != nil {
			f.ChoG = math.Round(*o.ChoG)
		}
		f.Overridden = true
		fixed[o.Index] = true
		any = true
	}
	if !any {
		return
	}
	var fixedSum, freeSum float64
	var weights [32]float64
	nFree := 0
	for i, f := range d.Feeds {
		if fixed[i] {
			fixedSum += f.ChoG
		} else {
			freeSum += f.ChoG
			nFree++
		}
	}
	left := d.ChoG - fixedSum
	if left < 0 || nFree == 0 {
		for i := range d.Feeds {
			if !fixed[i] {
				d.Feeds[i].ChoG = 0
			}
		}
		if d.ChoG != fixedSum {
			// The day grows to carry the overridden feeds; its g/kg is
			// rounded up and the few grams of rounding go to a feed that
			// is not overridden, when there is one.
			d.ChoGPerKg = ceil1(fixedSum / p.body.MassKg)
			d.ChoG = math.Round(d.ChoGPerKg * p.body.MassKg)
			extra := d.ChoG - fixedSum
			placed := false
			for i := range d.Feeds {
				if !d.Feeds[i].Overridden && d.Feeds[i].Label != labelDuring {
					d.Feeds[i].ChoG += extra
					placed = true
					break
				}
			}
			if !placed {
				// Every feed is fixed: the day is exactly their sum.
				d.ChoG = fixedSum
				d.ChoGPerKg = round1(fixedSum / p.body.MassKg)
			}
			d.Overridden = true
			macros(d, p.body.MassKg, p.body.FFMKg, *d.ExerciseEnergyKcal, dp.loadDay)
		}
	} else {
		w := weights[:0]
		for i, f := range d.Feeds {
			if !fixed[i] && len(w) < cap(weights) {
				if freeSum > 0 {
					w = append(w, f.ChoG)
				} else {
					w = append(w, 1)
				}
			}
		}
		var out [32]float64
		split(left, w, out[:len(w)])
		j := 0
		for i := range d.Feeds {
			if !fixed[i] && j < len(w) {
				d.Feeds[i].ChoG = out[j]
				j++
			}
		}
	}
	sortFeeds(d.Feeds, fixed)
	if p.plan.PreEventMeal != nil {
		for _, f := range d.Feeds {
			if f.Label == labelPreEvent && f.Overridden {
				p.plan.PreEventMeal.At = f.At
				p.plan.PreEventMeal.ChoG = f.ChoG
				p.plan.PreEventMeal.ChoGPerKg = round1(f.ChoG / p.body.MassKg)
				// A meal moved to or past the start is 0 h before it (and
				// outside the guideline, which its finding says).
				p.plan.PreEventMeal.HoursBefore = round1(max(0, p.evStart.Sub(f.At).Hours()))
			}
		}
	}
}

const (
	labelPreEvent = "pre-event meal"
	labelDuring   = "during event"
	labelRecovery = "recovery"
	labelRefuel   = "refuel"
)

// trainingDay plans a day by its training load.
func (p *planner) trainingDay(date time.Time, role string) dayPlan {
	ds := date.Format("2006-01-02")
	eff, tm := dayLoad(p.sessionsOn(ds))
	b := bandFor(eff, tm)
	dp := dayPlan{date: date, day: Day{
		Date: ds, Role: role, TrainingMin: tm, LoadBand: b.name,
		BandMinGPerKg: b.g.Min, BandMaxGPerKg: b.g.Max, ChoGPerKg: bandTarget(b, eff),
	}}
	for _, s := range p.sessionsOn(ds) {
		if s.pct >= 75 || s.durMin >= 90 {
			// a demanding session: a recovery feed soon after it
			end := s.start.Add(time.Duration(s.durMin * float64(time.Minute)))
			dp.fixed = append(dp.fixed, Feed{At: end.Add(30 * time.Minute), Label: labelRecovery,
				ChoG: math.Round(gRecoveryFeed.Min * p.body.MassKg), ProteinG: math.Round(gProteinMeal.Min * p.body.MassKg)})
			dp.blocked = append(dp.blocked, window{end, end.Add(2 * time.Hour)})
		}
	}
	return dp
}

// days lists dates from first for n days.
func dateSeq(first time.Time, n int) []time.Time {
	out := make([]time.Time, n)
	for i := range out {
		out[i] = first.AddDate(0, 0, i)
	}
	return out
}

func midnight(t time.Time, loc *time.Location) time.Time {
	t = t.In(loc)
	y, m, d := t.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, loc)
}

func loadDaysOf(protocol string) int {
	switch protocol {
	case ProtocolOneDay:
		return 1
	case ProtocolThreeDay:
		return 3
	}
	return 2
}

func (p *planner) taperDays() int {
	n := p.req.TaperDays
	if n == 0 {
		n = 7
	}
	return n
}

// loading plans the taper, the load days, the event day and the day after.
func (p *planner) loading() {
	proto := p.req.Protocol
	if proto == "" {
		proto = ProtocolTwoDay
		p.find("protocol-default", LevelNote, "plan", SrcACSM,
			"No protocol was given; the two-day protocol (36–48 h at 10–12 g/kg) is used.")
	}
	p.plan.Protocol = proto
	nLoad := loadDaysOf(proto)
	taper := max(p.taperDays(), nLoad)
	evDay := midnight(p.evStart, p.loc)
	first := evDay.AddDate(0, 0, -taper)
	dates := dateSeq(first, taper+2)
	dps := make([]dayPlan, len(dates))
	for i, dt := range dates {
		before := taper - i // days before the event
		switch {
		case before > nLoad:
			dps[i] = p.trainingDay(dt, RoleTaper)
		case before > 0:
			dps[i] = p.loadDay(dt, proto, before == nLoad)
		case before == 0:
			dps[i] = p.eventDay(dt, gDuringFloor(p.ev.ExpectedDurationMin))
		default:
			dps[i] = p.recoveryDay(dt)
		}
	}
	if p.ev.ExpectedDurationMin < gLoadingEvent.Min {
		p.find("loading-not-needed", LevelNote, "plan", SrcACSM,
			"Carbohydrate loading is for events over %.0f min; this event is expected to last %.0f min. "+
				"Fuelling up with %.0f–%.0f g/kg in the 24 h before is enough.",
			gLoadingEvent.Min, p.ev.ExpectedDurationMin, gFuellingUp.Min, gFuellingUp.Max)
	} else {
		p.find("loading-event-long", LevelOK, "plan", SrcACSM,
			"The event is expected to last %.0f min, over %.0f min, so carbohydrate loading suits it.",
			p.ev.ExpectedDurationMin, gLoadingEvent.Min)
	}
	rehome(dps)
	p.plan.Days = make([]Day, len(dps))
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	p.eventSimulation(first, dates[taper-nLoad], evDay, true)
	if proto == ProtocolOneDay {
		p.find("one-day-loading", LevelNote, "plan", SrcBussau,
			"One-day loading: about %.0f g/kg in 24 h with rest, after a short intense bout, reaches high muscle glycogen.",
			gLoadingOneDay.Min)
		// The protocol starts with the bout: look for a short, hard
		// session on the load day.
		loadDate := dates[taper-nLoad].Format("2006-01-02")
		bout := false
		for _, s := range p.sessionsOn(loadDate) {
			bout = bout || (s.durMin <= gShortBout.Max && s.pct >= gShortBout.Min)
		}
		if !bout {
			p.find("one-day-bout", LevelNote, "day:"+loadDate, SrcBussau,
				"No short intense bout (at most %g min at %g%% of VO2max or more) is logged on the load day %s; one-day loading was studied after one.",
				gShortBout.Max, gShortBout.Min, loadDate)
		}
	}
}

// loadDay plans one day of a loading protocol.
func (p *planner) loadDay(date time.Time, proto string, firstLoadDay bool) dayPlan {
	dp := p.trainingDay(date, RoleLoad)
	dp.loadDay = true
	d := &dp.day
	d.BandMinGPerKg, d.BandMaxGPerKg = gLoadingTwoDay.Min, gLoadingTwoDay.Max
	d.ChoGPerKg = gLoadOther.Min
	if proto == ProtocolTwoDay {
		d.ChoGPerKg = gLoadTwoDay.Min
	}
	d.LowFibre = true
	d.Advice = make([]string, 0, 3)
	d.Advice = append(d.Advice,
		"Choose low-fibre, low-fat carbohydrate foods (white bread, rice, pasta, juice, sports drinks) to reach the target without gut upset.",
		"Spread the carbohydrate over every eating occasion; drink enough fluid.")
	if proto == ProtocolOneDay && firstLoadDay {
		d.Advice = append(d.Advice, "Start the load day with the short, intense bout planned with the coach, then rest.")
	}
	return dp
}

// eventDay plans the day of the event: the pre-event meal, the in-event
// fuelling, a recovery feed and ordinary meals away from the race.
func (p *planner) eventDay(date time.Time, rate float64) dayPlan {
	dp := p.trainingDay(date, RoleEvent)
	dp.fixed = dp.fixed[:0]
	dp.blocked = dp.blocked[:0]
	d := &dp.day
	eff, tm := dayLoad(p.sessionsOn(d.Date))
	eff += p.ev.ExpectedDurationMin * intensityFactor(p.evPct)
	tm += p.ev.ExpectedDurationMin
	b := bandFor(eff, tm)
	d.TrainingMin, d.LoadBand = tm, b.name
	d.BandMinGPerKg, d.BandMaxGPerKg = b.g.Min, b.g.Max
	d.ChoGPerKg = bandTarget(b, eff)
	mass := p.body.MassKg

	fixed := make([]Feed, 0, 3)
	blockFrom := p.evStart.Add(-90 * time.Minute)
	if pm := p.preEventMeal(); pm != nil {
		if p.plan.PreEventMeal == nil || pm.At.Format("2006-01-02") == d.Date {
			// A meal on the day before keeps what its day made of it (a
			// feed override) when this day is rebuilt; one on this day is
			// overridden again as the day is built.
			p.plan.PreEventMeal = pm
		}
		fixed = append(fixed, Feed{At: pm.At, Label: labelPreEvent, ChoG: pm.ChoG, ProteinG: math.Round(0.5 * gProteinMeal.Min * mass)})
		blockFrom = pm.At.Add(-90 * time.Minute)
	}
	de := p.duringEventPlan(rate)
	p.plan.DuringEvent = de
	if de.TotalChoG > 0 {
		fixed = append(fixed, Feed{At: p.evStart, Label: labelDuring, ChoG: de.TotalChoG})
	}
	blockTo := p.evEnd.Add(2 * time.Hour)
	if p.ev.ExpectedDurationMin >= gDuringSmall.Min {
		rec := p.evEnd.Add(30 * time.Minute)
		fixed = append(fixed, Feed{At: rec, Label: labelRecovery,
			ChoG: math.Round(gRecoveryFeed.Min * mass), ProteinG: math.Round(gProteinMeal.Min * mass)})
		blockTo = rec.Add(90 * time.Minute)
	}
	dp.fixed = fixed
	dp.blocked = append(dp.blocked, window{blockFrom, blockTo})
	// Raise the day target (inside the band) to carry the protocol feeds
	// that fall on this day.
	var sum float64
	for _, f := range fixed {
		if f.At.Format("2006-01-02") == d.Date {
			sum += f.ChoG
		}
	}
	need := math.Ceil(sum/mass*2) / 2
	if need > d.ChoGPerKg {
		d.ChoGPerKg = math.Min(need, b.g.Max)
	}
	d.Advice = []string{"Keep to foods and drinks already tried in training."}
	return dp
}

// keepOwn moves to the front the fixed feeds of a day plan that fall on
// its own date and returns how many there are.
func keepOwn(dp *dayPlan) int {
	next := dp.date.AddDate(0, 0, 1)
	n := 0
	for _, f := range dp.fixed {
		if !f.At.Before(dp.date) && f.At.Before(next) {
			dp.fixed[n] = f
			n++
		}
	}
	return n
}

// rehome moves each protocol feed to the plan day it falls on (a pre-event
// meal the evening before an event just after midnight, a recovery feed
// after midnight), with the windows that keep ordinary meals away from it;
// a feed beyond the plan's days is dropped. dps are consecutive days.
func rehome(dps []dayPlan) {
	for i := range dps {
		dp := &dps[i]
		var moved [4]Feed
		nm := 0
		next := dp.date.AddDate(0, 0, 1)
		for _, f := range dp.fixed {
			if (f.At.Before(dp.date) || !f.At.Before(next)) && nm < len(moved) {
				moved[nm] = f
				nm++
			}
		}
		if nm == 0 {
			continue
		}
		blocked := dp.blocked
		dp.fixed = dp.fixed[:keepOwn(dp)]
		for _, f := range moved[:nm] {
			// A feed after the plan's last day (a recovery feed after
			// midnight) is beyond the plan and goes.
			for j := range dps {
				o := &dps[j]
				if !f.At.Before(o.date) && f.At.Before(o.date.AddDate(0, 0, 1)) {
					o.fixed = append(o.fixed, f)
					o.blocked = append(o.blocked, blocked...)
					break
				}
			}
		}
	}
}

// gDuringFloor is the in-event g/h recommended before the stores are
// known: the floor of the duration's band.
func gDuringFloor(min float64) float64 {
	switch {
	case min <= gDuringSmall.Max:
		return 0
	case min <= gDuring3060Time.Max:
		return gDuring3060.Min
	}
	return gLongFloor.Min
}

// preEventMeal is 1 g/kg per hour before the start, 3 h before by
// default; only for events over 60 min. It is not put in the night hours
// (before 05:00) when the guideline's 1–4 h window allows: it moves later,
// to 05:00 when that is still an hour before the start, or else earlier,
// to the evening before (4 h before a start in the small hours). Only when
// the whole window lies in the night does it stay there, 1 h before, and a
// finding says so.
func (p *planner) preEventMeal() *PreEventMeal {
	if p.ev.ExpectedDurationMin <= gPreEventMin.Min {
		return nil
	}
	earliestMin := int(gPreEarliest.Min * 60)
	night := func(t time.Time) bool { return t.Hour()*60+t.Minute() < earliestMin }
	before := func(h float64) time.Time { return p.evStart.Add(-time.Duration(h * float64(time.Hour))) }
	h := gPreDefaultH.Min
	p.preMealNight = false
	if at := before(h); night(at) {
		switch later := clockOn(at, earliestMin); {
		case p.evStart.Sub(later).Hours() >= gPreEventHours.Min:
			h = math.Floor(p.evStart.Sub(later).Hours()*2) / 2
		case !night(before(gPreEventHours.Max)):
			h = gPreEventHours.Max
		default:
			h = gPreEventHours.Min
			p.preMealNight = true
		}
	}
	h = math.Max(gPreEventHours.Min, math.Min(gPreEventHours.Max, h))
	gkg := math.Max(gPreEventCho.Min, math.Min(gPreEventCho.Max, h))
	return &PreEventMeal{
		At:          before(h),
		HoursBefore: h,
		ChoGPerKg:   gkg,
		ChoG:        math.Round(gkg * p.body.MassKg),
	}
}

// duringEventPlan is the in-event plan at a g/h rate (or the override).
func (p *planner) duringEventPlan(rate float64) *DuringEvent {
	de := &DuringEvent{
		DurationMin: p.ev.ExpectedDurationMin,
		Band:        duringBand(p.ev.ExpectedDurationMin),
		EnergyKcal:  math.Round(p.evKcal),
		ChoShare:    math.Round(p.evShare*100) / 100,
		ChoUsedG:    math.Round(p.evUseGPH * p.evDurH),
	}
	if p.req.DuringEventChoGPerH != nil {
		rate = *p.req.DuringEventChoGPerH
		de.Overridden = true
	}
	de.ChoGPerH = rate
	de.TotalChoG = math.Round(rate * p.evDurH)
	return de
}

func duringBand(min float64) string {
	switch {
	case min <= gDuringNone.Max:
		return "none"
	case min < gDuringSmall.Max:
		return "small"
	case min <= gDuring3060Time.Max:
		return "30-60"
	}
	return "up-to-90"
}

// duringBandRange is the g/h range of a band.
func duringBandRange(band string) (lo, hi float64, src string) {
	switch band {
	case "none":
		return 0, 0, SrcACSM
	case "small":
		return gDuringSmallG.Min, gDuringSmallG.Max, SrcACSM
	case "30-60":
		return gDuring3060.Min, gDuring3060.Max, SrcACSMJeuk
	}
	return gDuringUpTo90.Min, gDuringUpTo90.Max, SrcACSMJeuk
}

// recoveryDay is the day after the event: daily needs by training load,
// at least the moderate band after an event over 90 min.
func (p *planner) recoveryDay(date time.Time) dayPlan {
	dp := p.trainingDay(date, RoleRecovery)
	d := &dp.day
	if p.ev.ExpectedDurationMin >= gLoadingEvent.Min && d.BandMaxGPerKg < gBandModerate.Max {
		b := bands[2]
		d.LoadBand = b.name
		d.BandMinGPerKg, d.BandMaxGPerKg = b.g.Min, b.g.Max
		d.ChoGPerKg = b.g.Min
	}
	d.Advice = []string{"Refuel and rehydrate after the event; include protein at each meal."}
	return dp
}

// race plans the event day alone.
func (p *planner) race() {
	evDay := midnight(p.evStart, p.loc)
	dp := p.eventDay(evDay, gDuringFloor(p.ev.ExpectedDurationMin))
	// A pre-event meal the evening before, or a recovery feed after
	// midnight, belongs to the day it falls on: the plan then covers that
	// day too.
	dps := make([]dayPlan, 0, 3)
	if pm := p.plan.PreEventMeal; pm != nil && pm.At.Before(evDay) {
		// The day before carries the meal on top of its own training-load
		// target, as far as its band allows.
		prev := p.trainingDay(evDay.AddDate(0, 0, -1), RoleTraining)
		prev.day.ChoGPerKg = math.Min(prev.day.BandMaxGPerKg, prev.day.ChoGPerKg+pm.ChoGPerKg)
		dps = append(dps, prev)
	}
	dps = append(dps, dp)
	for _, f := range dp.fixed {
		if !f.At.Before(evDay.AddDate(0, 0, 1)) {
			dps = append(dps, p.recoveryDay(evDay.AddDate(0, 0, 1)))
			break
		}
	}
	rehome(dps)
	p.plan.Days = make([]Day, len(dps))
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	p.eventSimulation(evDay.AddDate(0, 0, -1), time.Time{}, evDay, false)
}

// week plans days by training load.
func (p *planner) week() {
	var first time.Time
	if p.req.StartDate != "" {
		first, _ = time.ParseInLocation("2006-01-02", p.req.StartDate, p.loc)
	} else {
		first = midnight(p.sessions[0].start, p.loc)
	}
	n := p.req.Days
	if n == 0 {
		n = 7
	}
	p.plan.Days = make([]Day, n)
	dps := make([]dayPlan, n)
	for i, dt := range dateSeq(first, n) {
		dps[i] = p.trainingDay(dt, RoleTraining)
	}
	rehome(dps)
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	from := first.Unix()
	to := first.AddDate(0, 0, n).Unix()
	curve := make([]GlycogenPoint, 0, (to-from)/3600+2)
	ex := p.exercises(from, to)
	in := p.intakes(p.plan.Days, to)
	s := p.sb.simulate(p.startState(), from, to, ex, in, &curve, 3600, p.loc)
	curve = append(curve, p.sb.point(s, to, p.loc))
	p.plan.Glycogen = &Glycogen{
		MuscleGStart:        math.Round(p.sb.muscleG(s)),
		WorkingMuscleGStart: math.Round(p.sb.workingG(s)),
		LiverGStart:         math.Round(s.LiverG),
		MuscleGCapacity:     math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg)),
		Curve:               curve,
	}
	p.find("week-glycogen", LevelNote, "glycogen", SrcModel,
		"For a week plan the glycogen figures are the expected state at the end of the last day: muscle about %.0f g, liver about %.0f g.",
		p.plan.Glycogen.MuscleGStart, p.plan.Glycogen.LiverGStart)
}

// startState is the assumed state at midnight before the first day of a
// simulation: typical muscle glycogen density, and the liver and gut as a
// usual day of a trained athlete leaves them (the moderate band's lower
// end, 5 g/kg, over the default eating occasions): the fed liver of the
// evening (100–120 g at 70 kg, common practice) a few hours into the
// night's fast, the last of the evening meal still being absorbed.
// Computed once per plan.
func (p *planner) startState() simState {
	if p.haveStart {
		return p.start
	}
	s := simState{Dw: gModelTypical.Min, Do: gModelTypical.Min, LiverG: p.sb.liverCapG}.since(24)
	sched := scheduleFor(p.occasions)
	var w, g [16]float64
	var in [16]intake
	ns := min(len(sched), len(w))
	for i := 0; i < ns; i++ {
		w[i] = sched[i].weight
	}
	split(gBandModerate.Min*p.body.MassKg, w[:ns], g[:ns])
	for i := 0; i < ns; i++ {
		in[i] = intake{at: int64(sched[i].hhmm) * 60, g: g[i]}
	}
	s = p.sb.simulate(s, 0, 24*3600, nil, in[:ns], nil, 3600, time.UTC)
	s.Dw, s.Do = gModelTypical.Min, gModelTypical.Min
	p.start, p.haveStart = s.since(24), true
	return p.start
}

// exercises lists the training sessions in [from, to) as simulation bouts.
func (p *planner) exercises(from, to int64) []exercise {
	out := make([]exercise, 0, len(p.sessions)+1)
	for _, s := range p.sessions {
		st := s.start.Unix()
		en := st + int64(s.durMin*60)
		if en <= from || st >= to || s.durMin <= 0 {
			continue
		}
		use := sessionKcalPerH(p.body, s.modality, s.pct) * ChoShare(s.pct) / gAtwaterCho.Min
		out = append(out, exercise{start: st, end: en, choUseGPerH: use, cover: coverShare(s.pct)})
	}
	return out
}

// intakes lists the feeds of days before `to` (in-event fuelling excluded:
// the race model eats it continuously).
func (p *planner) intakes(days []Day, to int64) []intake {
	n := 0
	for _, d := range days {
		n += len(d.Feeds)
	}
	out := make([]intake, 0, n)
	for _, d := range days {
		for _, f := range d.Feeds {
			if f.Label == labelDuring || f.At.Unix() >= to {
				continue
			}
			out = append(out, intake{at: f.At.Unix(), g: f.ChoG})
		}
	}
	// feeds are sorted within a day; days are in order
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && out[j].at < out[j-1].at; j-- {
			out[j], out[j-1] = out[j-1], out[j]
		}
	}
	return out
}

// usualIntakes spreads each day's training-load target (the athlete's usual
// intake) over the default schedule, for the comparison with the plan.
func (p *planner) usualIntakes(days []Day, until int64) []intake {
	sched := scheduleFor(p.occasions)
	out := make([]intake, 0, len(days)*len(sched))
	var w [16]float64
	var g [16]float64
	ns := min(len(sched), len(w))
	for i := 0; i < ns; i++ {
		w[i] = sched[i].weight
	}
	for _, d := range days {
		date, err := time.ParseInLocation("2006-01-02", d.Date, p.loc)
		if err != nil {
			continue
		}
		// The day as this engine plans a training day: its band's target,
		// raised for adequate energy availability.
		sess := p.sessionsOn(d.Date)
		eff, tm := dayLoad(sess)
		b := bandFor(eff, tm)
		ud := Day{BandMaxGPerKg: b.g.Max, ChoGPerKg: bandTarget(b, eff)}
		ud.ChoG = math.Round(ud.ChoGPerKg * p.body.MassKg)
		var exKcal float64
		for _, s := range sess {
			exKcal += sessionKcalPerH(p.body, s.modality, s.pct) * s.durMin / 60
		}
		macros(&ud, p.body.MassKg, p.body.FFMKg, exKcal, false)
		p.raiseForEnergy(&ud, exKcal, false)
		split(ud.ChoG, w[:ns], g[:ns])
		for i := 0; i < ns; i++ {
			at := clockOn(date, sched[i].hhmm).Unix()
			if at < until {
				out = append(out, intake{at: at, g: g[i]})
			}
		}
	}
	return out
}

// eventSimulation runs the stores from `first` to the start line, settles
// the in-event g/h from them, and fills the glycogen figures. loadStart is
// the first load day (zero for a race plan); evDay is the event day.
func (p *planner) eventSimulation(first, loadStart, evDay time.Time, loading bool) {
	from := first.Unix()
	start := p.evStart.Unix()
	dayStart := evDay.Unix()
	ex := p.exercises(from, start)
	in := p.intakes(p.plan.Days, start)
	usualBefore := !loading && (len(p.plan.Days) == 0 || p.plan.Days[0].Date != first.Format("2006-01-02"))
	if usualBefore {
		// A race plan: the day before follows the usual intake.
		in = append(p.usualIntakes([]Day{{Date: first.Format("2006-01-02")}}, dayStart), in...)
	}
	curve := make([]GlycogenPoint, 0, (start-from)/3600+2)
	s0 := p.startState()
	var sLoad simState
	if loading {
		sLoad = p.sb.simulate(s0, from, loadStart.Unix(), ex, in, &curve, 3600, p.loc)
		s0 = p.sb.simulate(sLoad, loadStart.Unix(), dayStart, ex, in, &curve, 3600, p.loc)
	} else {
		s0 = p.sb.simulate(s0, from, dayStart, ex, in, &curve, 3600, p.loc)
	}
	mark := len(curve)
	sStart := p.sb.simulate(s0, dayStart, start, ex, in, &curve, 3600, p.loc)

	// Settle the in-event rate from the stores at the start line, then
	// rebuild the event day's feeds for it and re-run the event day.
	if !p.plan.DuringEvent.Overridden {
		if rate := p.neededRate(sStart); rate != p.plan.DuringEvent.ChoGPerH {
			for i := range p.plan.Days {
				if p.plan.Days[i].Role == RoleEvent {
					dp := p.eventDay(evDay, rate)
					dp.fixed = dp.fixed[:keepOwn(&dp)] // feeds on other days stay there
					p.plan.Days[i] = p.buildDay(&dp)
				}
			}
			in = p.intakes(p.plan.Days, start)
			if usualBefore {
				in = append(p.usualIntakes([]Day{{Date: first.Format("2006-01-02")}}, dayStart), in...)
			}
			curve = curve[:mark]
			sStart = p.sb.simulate(s0, dayStart, start, ex, in, &curve, 3600, p.loc)
		}
	}
	de := p.plan.DuringEvent
	curve = append(curve, p.sb.point(sStart, start, p.loc))

	g := &Glycogen{
		MuscleGStart:        math.Round(p.sb.muscleG(sStart)),
		WorkingMuscleGStart: math.Round(p.sb.workingG(sStart)),
		LiverGStart:         math.Round(sStart.LiverG),
		MuscleGCapacity:     math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg)),
		Curve:               curve,
	}
	outH, _ := p.sb.race(sStart, p.evDurH, p.evUseGPH, p.evCover, 0)
	g.RunsOutAtMin, g.RunsOutAtKm = p.runsOut(outH)
	outH2, _ := p.sb.race(sStart, p.evDurH, p.evUseGPH, p.evCover, de.ChoGPerH)
	g.RunsOutWithIntakeAtMin, g.RunsOutWithIntakeAtKm = p.runsOut(outH2)
	p.plan.Glycogen = g
	p.startDensity = sStart.Dw

	if loading {
		// The usual intake instead of the load, for comparison.
		usual := p.usualIntakes(p.plan.Days, start)
		us := p.sb.simulate(p.startState(), from, start, ex, usual, nil, 3600, p.loc)
		u := math.Round(p.sb.muscleG(us))
		g.UsualIntakeMuscleGStart = &u
		gained := (p.sb.muscleG(sStart) + sStart.LiverG) - (p.sb.muscleG(sLoad) + sLoad.LiverG)
		kg := math.Max(0, gained*(1+gWater.Min)/1000)
		kg = math.Round(kg*10) / 10
		p.plan.ExpectedMassGainKg = &kg
	}
}

// neededRate is the in-event g/h: the least (in steps of 5 g/h) that keeps
// the stores from running out before the finish, held inside the band for
// the event's duration (never above 90 g/h).
func (p *planner) neededRate(s simState) float64 {
	band := duringBand(p.ev.ExpectedDurationMin)
	lo, hi, _ := duringBandRange(band)
	floor := gDuringFloor(p.ev.ExpectedDurationMin)
	if band == "none" {
		return 0
	}
	if band == "small" {
		lo = 0
	}
	lasts := func(rate float64) bool {
		out, _ := p.sb.race(s, p.evDurH, p.evUseGPH, p.evCover, rate)
		return out < 0
	}
	if lasts(0) {
		return math.Max(floor, lo)
	}
	// binary search over multiples of 5 g/h in [lo, hi]
	a, b := int(lo/5), int(hi/5)
	if !lasts(float64(b) * 5) {
		return hi
	}
	for a < b {
		m := (a + b) / 2
		if lasts(float64(m) * 5) {
			b = m
		} else {
			a = m + 1
		}
	}
	return math.Max(floor, float64(a)*5)
}

// runsOut turns hours into the event into minutes and km (null if never).
func (p *planner) runsOut(h float64) (min, km *float64) {
	if h < 0 {
		return nil, nil
	}
	m := math.Round(h * 60)
	min = &m
	if p.ev.DistanceKm != nil && p.evDurH > 0 {
		k := round1(h / p.evDurH * *p.ev.DistanceKm)
		km = &k
	}
	return min, km
}

// repletion plans the refuelling between session_end and next_start.
func (p *planner) repletion() {
	end := p.req.SessionEnd.In(p.loc)
	next := p.req.NextStart.In(p.loc)
	gapH := next.Sub(end).Hours()
	mass := p.body.MassKg
	r := &Repletion{GapH: round1(gapH), Feeds: []Feed{}}
	r.Speedy = gapH < gSpeedyGap.Min
	var windowEnd time.Time
	if r.Speedy {
		r.ChoGPerKgPerH = math.Round((gRepletionRate.Min+gRepletionRate.Max)/2*10) / 10
		winH := math.Min(gRepletionWin.Min, gapH)
		p.repWinH = winH
		windowEnd = end.Add(time.Duration(winH * float64(time.Hour)))
		const every = 30 * time.Minute
		n := int(math.Ceil(winH / every.Hours()))
		if n < 1 {
			n = 1
		}
		total := math.Round(r.ChoGPerKgPerH * mass * winH)
		var w, g [16]float64
		n = min(n, len(w))
		for i := 0; i < n; i++ {
			w[i] = 1
		}
		split(total, w[:n], g[:n])
		r.Feeds = make([]Feed, n)
		for i := 0; i < n; i++ {
			r.Feeds[i] = Feed{At: end.Add(time.Duration(i) * every), Label: labelRefuel, ChoG: g[i]}
		}
		r.Feeds[0].ProteinG = math.Round(gRepletionProt.Min * mass)
	}
	// Days from the session's end to the next start.
	first := midnight(end, p.loc)
	last := midnight(next, p.loc)
	nDays := int(math.Round(last.Sub(first).Hours()/24)) + 1
	p.plan.Days = make([]Day, nDays)
	blocked := []window{{end, windowEnd}, {next.Add(-time.Hour), next.Add(90 * time.Minute)}}
	dps := make([]dayPlan, nDays)
	for i, dt := range dateSeq(first, nDays) {
		dp := p.trainingDay(dt, RoleRepletion)
		// Recovery feeds of later sessions stay; the refuelling replaces
		// the one of the session that just ended.
		keep := dp.fixed[:0]
		for _, f := range dp.fixed {
			if !f.At.Before(windowEnd) && !f.At.Before(next) {
				keep = append(keep, f)
			}
		}
		dp.fixed = keep
		dp.blocked = append(dp.blocked[:0], blocked...)
		ds := dp.day.Date
		for _, f := range r.Feeds {
			if f.At.Format("2006-01-02") == ds {
				dp.fixed = append(dp.fixed, f)
			}
		}
		var sum float64
		for _, f := range dp.fixed {
			sum += f.ChoG
		}
		if need := math.Ceil(sum/mass*2) / 2; need > dp.day.ChoGPerKg {
			dp.day.ChoGPerKg = math.Min(need, dp.day.BandMaxGPerKg)
		}
		dps[i] = dp
	}
	rehome(dps)
	for i := range dps {
		p.plan.Days[i] = p.buildDay(&dps[i])
	}
	// Feeds may have moved or been overridden; the repletion feeds shown are
	// those of the days.
	if r.Speedy {
		r.Feeds = r.Feeds[:0]
		for _, d := range p.plan.Days {
			for _, f := range d.Feeds {
				if f.Label == labelRefuel {
					r.Feeds = append(r.Feeds, f)
				}
			}
		}
	}
	// Stores at the session's end: when the training log holds the session
	// (ending within 15 min of session_end), the simulation runs that day
	// from midnight through it on the day's feeds; otherwise the working
	// muscle is taken as near the top of the depleted band, as after a
	// demanding session.
	from, to := end.Unix(), next.Unix()
	in := p.intakes(p.plan.Days, to)
	s := p.startState()
	s.Dw = gDepleted.Max
	s = s.since(0)
	for _, ses := range p.sessions {
		sEndAt := ses.start.Add(time.Duration(ses.durMin * float64(time.Minute)))
		if d := sEndAt.Sub(end); d < -15*time.Minute || d > 15*time.Minute || ses.durMin <= 0 {
			continue
		}
		dayStart := midnight(ses.start, p.loc).Unix()
		ex := p.exercises(dayStart, from)
		s = p.sb.simulate(p.startState(), dayStart, from, ex, in, nil, 3600, p.loc)
		r.SessionSimulated = true
		break
	}
	curve := make([]GlycogenPoint, 0, (to-from)/900+2)
	sEnd := p.sb.simulate(s, from, to, nil, in, &curve, 900, p.loc)
	curve = append(curve, p.sb.point(sEnd, to, p.loc))
	r.MuscleGAtNextStart = math.Round(p.sb.muscleG(sEnd))
	r.WorkingMuscleGAtNextStart = math.Round(p.sb.workingG(sEnd))
	r.WorkingMuscleGAtEnd = math.Round(p.sb.workingG(s))
	r.MuscleGCapacity = math.Round(GlycogenG(gModelCapacity.Min, p.body.SkeletalKg))
	r.Curve = curve
	p.plan.Repletion = r
}
