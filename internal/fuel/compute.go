package fuel

import "time"

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
	marks        []int    // where find's message names body masses
	startDensity float64  // working-muscle glycogen at the start line, mmol/kg
	repWinH      float64  // speedy refuelling window, hours
	occNotes     []occasionNote
	start        simState // startState, once computed
	haveStart    bool
	preMealNight bool    // the pre-event meal could only go in the night hours
	massGainG    float64 // glycogen the load adds to the usual state at the start
	eventExtras          // multi-sport legs, stages, long events and sessions
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
		if len(p.stages) > 0 {
			p.stageRace(true)
		} else {
			p.loading()
		}
	case KindRace:
		if len(p.stages) > 0 {
			p.stageRace(false)
		} else {
			p.race()
		}
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
	if req.Event != nil && len(req.Event.Segments) > 0 {
		// Legs are the working muscle of the bike and the run; the swim
		// swaps in the arms and trunk (see segments.go).
		p.body = NewBody(req.Athlete, "run")
		p.body.WorkingMethod = "leg muscle (the swim draws on the arms and trunk)"
	}
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
		s := sessionInfo{date: t.Date, start: clockOn(d, startMin), durMin: t.DurationMin, modality: mod, pct: intensityPct(in), trainLow: t.TrainLow, powerW: t.AveragePowerW}
		if r, _, ok := paceKcalPerH(p.body, mod, nil, t.AveragePowerW, t.DurationMin); ok && p.body.VO2max > 0 && in.Word != "pct" {
			// A measured power says more than a felt intensity: with the
			// VO2max known it sets the %VO2max (and so the fuel share),
			// as a paced stage's does. A %VO2max given is kept.
			s.pct, _ = pacePct(p.body, r)
		}
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
	p.eventFiguresOf(p.req.Event)
	p.setupStages()
}

// eventFiguresOf computes the figures of one event (or stage).
func (p *planner) eventFiguresOf(e *Event) {
	p.ev = e
	p.evStart = e.StartsAt.In(p.loc)
	p.evDurH = e.ExpectedDurationMin / 60
	p.evEnd = p.evStart.Add(time.Duration(e.ExpectedDurationMin * float64(time.Minute)))
	p.evDayDate = p.evStart.Format("2006-01-02")
	p.evPct = defaultRaceIntensity(e.ExpectedDurationMin)
	if e.IntensityPctVO2max != nil {
		p.evPct = *e.IntensityPctVO2max
	}
	p.pctFromPace = false
	if e.IntensityPctVO2max == nil && len(e.Segments) == 0 {
		p.paceIntensity(*e)
	}
	p.evKcal, p.evMethod = EventEnergy(p.body, *e, p.evPct)
	p.evShare = ChoShare(p.evPct)
	p.evUseGPH = p.evKcal / p.evDurH * p.evShare / gAtwaterCho.Min
	p.evCover = coverShare(p.evPct)
	if len(e.Segments) > 0 {
		p.segmentFigures(p.evPct)
	}
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
