package server

import (
	"errors"
	"fmt"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"time"

	"larder/internal/mass"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/store"
	"larder/web"
)

// Starting a plan: the start form prefilled from the client's records, its
// decoding, and the engine request built from it.

// staleMassDays: a body mass older than this is flagged on the plan form and page.
const staleMassDays = 14

// planStartForm is the start-a-plan form.
type planStartForm struct {
	Kind         string   `form:"kind" label:"Kind of plan" validate:"required,oneof=loading race repletion week"`
	Title        string   `form:"title" label:"Title" validate:"max=200"`
	EventID      int      `form:"event_id" label:"Event" validate:"gte=0"`
	Protocol     string   `form:"protocol" label:"Loading protocol" validate:"omitempty,oneof=two-day one-day three-day"`
	TaperDays    int      `form:"taper_days" label:"Days before the event covered" validate:"gte=0,lte=14"`
	IntensityPct *float64 `form:"intensity_pct" label:"Race intensity" unit:"% VO2max" validate:"omitempty,gte=20,lte=100"`
	// BodyMassKg is typed in BodyMassUnit (the client's unit when the form
	// was drawn) and holds kg once decodePlanStart has converted it.
	BodyMassKg      *float64   `form:"body_mass_kg" label:"Body mass" validate:"required"`
	BodyMassUnit    string     `form:"body_mass_unit"`
	BodyMassOn      *time.Time `form:"body_mass_on" label:"Date of the body mass"`
	BodyMassPrefill string     `form:"body_mass_prefill"` // the measurement on record, in kg
	BodyFatPct      *float64   `form:"body_fat_pct" label:"Body fat" unit:"%" validate:"omitempty,gte=3,lte=60"`
	HeightCm        *float64   `form:"height_cm" label:"Height" unit:"cm" validate:"omitempty,gte=120,lte=230"`
	VO2max          *float64   `form:"vo2max" label:"VO2max" unit:"ml/kg/min" validate:"omitempty,gte=20,lte=95"`
	EatingOccasions int        `form:"eating_occasions" label:"Eating occasions a day" validate:"gte=1,lte=10"`
	SessionEnd      string     `form:"session_end" label:"Session end" validate:"omitempty,localdatetime"`
	NextStart       string     `form:"next_start" label:"Next session start" validate:"omitempty,localdatetime"`
	TimeZone        string     `form:"time_zone" label:"Time zone" validate:"omitempty,iana_zone"`
	StartDate       *time.Time `form:"start_date" label:"First day"`
	Days            int        `form:"days" label:"Number of days" validate:"gte=0,lte=28"`
	CaffeineMgPerKg *float64   `form:"caffeine_mg_per_kg" label:"Caffeine before the start" unit:"mg/kg" validate:"omitempty,gt=0,lte=15"`
}

// planInputs is what the start form and the client's records give a request.
type planInputs struct {
	client   store.Client
	event    *store.Event
	training []store.TrainingSession
	form     planStartForm
}

func (s *Server) newPlanPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	q := r.URL.Query()
	v := url.Values{}
	kind := q.Get("kind")
	if kind == "" {
		kind = fuel.KindLoading
	}
	v.Set("kind", kind)
	v.Set("protocol", fuel.ProtocolTwoDay)
	v.Set("taper_days", "7")
	v.Set("eating_occasions", "5")
	v.Set("days", "7")
	v.Set("start_date", web.ISODate(s.Today()))
	if c.HeightCm != nil {
		v.Set("height_cm", web.Num(*c.HeightCm, 1))
	}
	v.Set("body_mass_unit", string(c.Unit))
	if m, err := s.Store.LatestBodyMass(r.Context(), c.ID); err == nil {
		v.Set("body_mass_kg", mass.Input(m.MassKg, c.Unit))
		v.Set("body_mass_prefill", web.Num(m.MassKg, 2))
		v.Set("body_mass_on", web.ISODate(m.MeasuredOn))
	} else if !errors.Is(err, store.ErrNotFound) {
		s.ServerError(w, r, err)
		return
	}
	if m, err := s.Store.LatestBodyFat(r.Context(), c.ID); err == nil && m.BodyFatPct != nil {
		v.Set("body_fat_pct", web.Num(*m.BodyFatPct, 1))
	}
	events, err := s.Store.ListEvents(r.Context(), c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	if id := q.Get("event"); id != "" {
		v.Set("event_id", id)
	} else if e := nextEvent(events, s.Now()); e != nil {
		v.Set("event_id", web.ID(e.ID))
	}
	// The athlete's zone: their next event's, else their latest event's
	// (a repletion plan after the season's race is still read there);
	// UTC only for a client without events.
	zone := "UTC"
	if e := nextEvent(events, s.Now()); e != nil {
		zone = e.TimeZone
	} else if n := len(events); n > 0 {
		zone = events[n-1].TimeZone
	}
	v.Set("time_zone", zone)
	if id, err := strconv.ParseInt(q.Get("training"), 10, 64); err == nil {
		if t, err := s.Store.TrainingByID(r.Context(), c.ID, id); err == nil && t.StartTime != "" {
			loc := loadZone(zone)
			start, _ := forms.ParseLocalDateTime(web.ISODate(t.OnDate)+"T"+t.StartTime, loc)
			end := start.Add(time.Duration(t.DurationMin) * time.Minute)
			v.Set("session_end", end.Format("2006-01-02T15:04"))
			if next, err := s.nextSessionAfter(r, c.ID, end, loc); err == nil && next != nil {
				v.Set("next_start", next.Format("2006-01-02T15:04"))
			}
			v.Set("kind", fuel.KindRepletion)
		}
	}
	s.renderPlanStart(w, r, http.StatusOK, c, events, forms.FromValues(v))
}

// nextSessionAfter finds the start of the first logged session after t.
func (s *Server) nextSessionAfter(r *http.Request, clientID int64, t time.Time, loc *time.Location) (*time.Time, error) {
	day := time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
	ts, err := s.Store.TrainingBetween(r.Context(), clientID, day, day.AddDate(0, 0, 2))
	if err != nil {
		return nil, err
	}
	for _, x := range ts {
		if x.StartTime == "" {
			continue
		}
		st, err := forms.ParseLocalDateTime(web.ISODate(x.OnDate)+"T"+x.StartTime, loc)
		if err == nil && st.After(t) {
			return &st, nil
		}
	}
	return nil, nil
}

func nextEvent(events []store.Event, now time.Time) *store.Event {
	for i := range events {
		if events[i].StartsAt.After(now) {
			return &events[i]
		}
	}
	return nil
}

func loadZone(name string) *time.Location {
	if loc, err := zoneByName(name); err == nil && name != "" {
		return loc
	}
	return time.UTC
}

func (s *Server) renderPlanStart(w http.ResponseWriter, r *http.Request, status int, c store.Client, events []store.Event, f forms.Form) {
	opts := []web.Option{{Value: "0", Label: "— no event —"}}
	var lines []web.EventLine
	for _, e := range events {
		opts = append(opts, web.Option{Value: web.ID(e.ID), Label: e.Name + ", " + web.DateTimeZone(e.StartsAt, e.TimeZone)})
		l := web.EventLine{Name: e.Name, Start: e.LocalStart().Format("Mon 2 Jan 2006 15:04"), Zone: e.TimeZone,
			Distance: "—", Duration: hoursWords(float64(e.ExpectedDurationMin)), Priority: store.PriorityLabel(e.Priority)}
		if e.DistanceKm != nil {
			l.Distance = web.Num(*e.DistanceKm, 3) + " km"
		}
		lines = append(lines, l)
	}
	v := web.PlanStartView{
		ClientID: c.ID, ClientName: c.Name, ClientCautions: c.Cautions, Sex: c.Sex,
		Events: opts, EventLines: lines, Kinds: planKinds, Protocols: planProtocols, Caution: fuel.Caution, Form: f,
		MassUnit: mass.Or(mass.Unit(f.Get("body_mass_unit")), c.Unit),
	}
	if on, err := time.Parse(forms.DateLayout, f.Get("body_mass_on")); err == nil {
		pre, _ := forms.ParseNumber(f.Get("body_mass_prefill"))
		v.BodyMassNote = "Latest measurement: " + mass.Text(pre, v.MassUnit) + " on " + web.Date(on) + "."
		if age := int(s.Today().Sub(on).Hours() / 24); age > staleMassDays {
			v.BodyMassWarning = fmt.Sprintf("The latest body mass is %d days old. Weigh the athlete again or check the figure before relying on the plan.", age)
		}
	} else {
		v.BodyMassNote = "No body mass on record: type today’s."
	}
	// Training the plan will see: the days around the chosen event, or
	// around today.
	from, to := s.Today().AddDate(0, 0, -3), s.Today().AddDate(0, 0, 7)
	switch kind := f.Get("kind"); {
	case kind == fuel.KindRepletion:
		if end, err := forms.ParseLocalDateTime(f.Get("session_end"), time.UTC); err == nil {
			d := dateOnly(end)
			from, to = d.AddDate(0, 0, -3), d.AddDate(0, 0, 1)
		}
	case kind == fuel.KindWeek:
		if start, err := time.Parse(forms.DateLayout, f.Get("start_date")); err == nil {
			days, _ := strconv.Atoi(f.Get("days"))
			from, to = start.AddDate(0, 0, -7), start.AddDate(0, 0, max(days, 1))
		}
	default:
		if id, err := strconv.ParseInt(f.Get("event_id"), 10, 64); err == nil && id > 0 {
			for _, e := range events {
				if e.ID == id {
					d := dateOnly(e.LocalStart())
					from, to = d.AddDate(0, 0, -10), d.AddDate(0, 0, 1)
				}
			}
		}
	}
	ts, err := s.Store.TrainingBetween(r.Context(), c.ID, from, to)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	v.TrainingNote = fmt.Sprintf("Sessions logged or planned from %s to %s. Edit the training log to change them.", web.Date(from), web.Date(to))
	if len(ts) == 0 {
		v.TrainingNote = fmt.Sprintf("No sessions logged or planned from %s to %s: the plan treats those days as rest days. Add sessions to the training log first if there are any.", web.Date(from), web.Date(to))
	}
	for _, t := range ts {
		v.Training = append(v.Training, web.TrainingLine{Date: web.Date(t.OnDate), Start: t.StartTime,
			What: sessionText(t), Status: t.Status})
	}
	s.Render(w, r, status, "New plan", "clients", web.PlanStartPage(v))
}

func dateOnly(t time.Time) time.Time {
	y, m, d := t.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
}

func sessionText(t store.TrainingSession) string {
	s := store.ModalityLabel(t.Modality) + " " + strconv.Itoa(t.DurationMin) + " min"
	if it := t.IntensityText(); it != "" {
		s += ", " + it
	}
	if t.DistanceKm != nil {
		s += ", " + web.Num(*t.DistanceKm, 2) + " km"
	}
	return s
}

func (s *Server) createPlan(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	events, err := s.Store.ListEvents(r.Context(), c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	pi, f := decodePlanStart(r.PostForm, c, events)
	in := pi.form
	refuse := func() {
		s.renderPlanStart(w, r, http.StatusUnprocessableEntity, c, events, f)
	}
	if f.Has() {
		refuse()
		return
	}
	if pi.training, err = s.trainingFor(r, pi); err != nil {
		s.ServerError(w, r, err)
		return
	}
	req, err := buildRequest(pi)
	if err != nil {
		mapRequestError(f, err)
		refuse()
		return
	}
	plan, err := fuel.Compute(req)
	if err != nil {
		mapRequestError(f, err)
		refuse()
		return
	}
	sugg, err := s.planSuggestions(r.Context(), c, plan)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	p := store.Plan{ClientID: c.ID, Kind: in.Kind, Title: in.Title}
	if in.Kind == fuel.KindLoading {
		p.Protocol = in.Protocol
	}
	if pi.event != nil && (in.Kind == fuel.KindLoading || in.Kind == fuel.KindRace) {
		p.EventID = &pi.event.ID
	}
	if p.Title == "" {
		p.Title = defaultTitle(in, pi.event)
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: *in.BodyMassKg, Suggestions: sugg}
	// The measurement date is kept only when the mass is the one on record.
	if in.BodyMassOn != nil && in.BodyMassPrefill != "" {
		if pre, err := forms.ParseNumber(in.BodyMassPrefill); err == nil && pre == *in.BodyMassKg {
			content.BodyMassOn = in.BodyMassOn
		}
	}
	v, err := s.Store.CreatePlan(r.Context(), Actor(r), &p, content)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Plan computed and saved as a draft (version "+strconv.Itoa(v.Version)+"). Check the findings, adjust, then publish.")
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID))
}

func defaultTitle(in planStartForm, e *store.Event) string {
	switch in.Kind {
	case fuel.KindLoading:
		proto := map[string]string{fuel.ProtocolTwoDay: "Two-day", fuel.ProtocolOneDay: "One-day", fuel.ProtocolThreeDay: "Three-day"}[in.Protocol]
		return proto + " carbohydrate loading for " + e.Name
	case fuel.KindRace:
		return "Race-day fuelling for " + e.Name
	case fuel.KindRepletion:
		// The session end as dates are written everywhere else.
		if end, err := time.Parse("2006-01-02T15:04", in.SessionEnd); err == nil {
			return "Repletion, " + end.Format("Mon 2 Jan 2006 15:04")
		}
		return "Repletion, " + strings.Replace(in.SessionEnd, "T", " ", 1)
	case fuel.KindWeek:
		return "Training week from " + web.Date(*in.StartDate)
	}
	return kindLabel(in.Kind)
}

// decodePlanStart reads and checks the start-a-plan form for a client with
// these events. The kind's own needs are checked even when a field already
// failed, so that every problem shows at once; the inputs are usable only
// when the form has no errors.
func decodePlanStart(values url.Values, c store.Client, events []store.Event) (planInputs, forms.Form) {
	var in planStartForm
	f := forms.Decode(values, &in)
	if in.BodyMassKg != nil {
		// Typed in the form's unit; the measurement on record stands when its
		// number was left as shown, so no rounding of lb moves it.
		u := mass.Or(mass.Unit(in.BodyMassUnit), mass.KG)
		pre, _ := forms.ParseNumber(in.BodyMassPrefill)
		kg := mass.Reread(*in.BodyMassKg, u, pre)
		if !mass.InRange(kg) {
			f.Errors.Add("body_mass_kg", mass.RangeMessage(u))
		}
		in.BodyMassKg = &kg
	}
	pi := planInputs{client: c, form: in}
	if in.EventID > 0 {
		for i := range events {
			if events[i].ID == int64(in.EventID) {
				pi.event = &events[i]
			}
		}
		if pi.event == nil {
			f.Errors.Add("event_id", "Choose one of this client’s events.")
		}
	}
	switch in.Kind {
	case fuel.KindLoading, fuel.KindRace:
		if pi.event == nil {
			f.Errors.Add("event_id", "A "+strings.ToLower(kindLabel(in.Kind))+" plan needs the event it leads to. Add the event on the client’s page first if it is missing.")
		}
		if in.Kind == fuel.KindLoading && in.Protocol == "" {
			f.Errors.Add("protocol", "Choose a loading protocol.")
		}
	case fuel.KindRepletion:
		if in.SessionEnd == "" {
			f.Errors.Add("session_end", "A repletion plan needs the end of the session.")
		}
		if in.NextStart == "" {
			f.Errors.Add("next_start", "A repletion plan needs the start of the next session.")
		}
		if in.TimeZone == "" && f.Err("time_zone") == "" {
			f.Errors.Add("time_zone", "A repletion plan needs the time zone the athlete is in.")
		}
	case fuel.KindWeek:
		if in.StartDate == nil && f.Err("start_date") == "" {
			f.Errors.Add("start_date", "A training-week plan needs its first day.")
		}
		if in.Days < 1 && f.Err("days") == "" {
			f.Errors.Add("days", "A training-week plan needs at least one day.")
		}
		if in.Days > 28 {
			// The tag allows 0 for the other kinds, which send no days;
			// a week plan's own range is 1 to 28.
			f.Errors["days"] = "A training-week plan covers 1 to 28 days."
		}
	}
	return pi, f
}

// trainingFor loads the sessions a plan reads: two weeks before its first
// day (for the glycogen simulation) to the day after its last.
func (s *Server) trainingFor(r *http.Request, pi planInputs) ([]store.TrainingSession, error) {
	var from, to time.Time
	switch {
	case pi.event != nil && (pi.form.Kind == fuel.KindLoading || pi.form.Kind == fuel.KindRace):
		d := dateOnly(pi.event.LocalStart())
		from, to = d.AddDate(0, 0, -14-pi.form.TaperDays), d.AddDate(0, 0, 1)
		if n := len(pi.event.Stages); n > 0 {
			// A stage race reads its sessions through the day after the last stage.
			to = dateOnly(pi.event.Stages[n-1].StartsAt.In(pi.event.Location())).AddDate(0, 0, 1)
		}
	case pi.form.Kind == fuel.KindRepletion:
		end, err := forms.ParseLocalDateTime(pi.form.SessionEnd, loadZone(pi.form.TimeZone))
		if err != nil {
			return nil, err
		}
		d := dateOnly(end)
		from, to = d.AddDate(0, 0, -3), d.AddDate(0, 0, 1)
	default:
		d := *pi.form.StartDate
		days := pi.form.Days
		from, to = d.AddDate(0, 0, -7), d.AddDate(0, 0, days)
	}
	return s.Store.TrainingBetween(r.Context(), pi.client.ID, from, to)
}

// buildRequest turns the form and the records into the engine's request.
func buildRequest(pi planInputs) (fuel.Request, error) {
	in := pi.form
	req := fuel.Request{
		Kind: in.Kind,
		Athlete: fuel.Athlete{Sex: pi.client.Sex, BodyMassKg: *in.BodyMassKg, HeightCm: in.HeightCm,
			BodyFatPct: in.BodyFatPct, VO2maxMlKgMin: in.VO2max},
		EatingOccasions: in.EatingOccasions,
		Cautions:        splitCautions(pi.client.Cautions),
	}
	if in.Kind == fuel.KindLoading {
		req.Protocol = in.Protocol
		req.TaperDays = in.TaperDays
	}
	if pi.event != nil && (in.Kind == fuel.KindLoading || in.Kind == fuel.KindRace) {
		e := pi.event
		modality := e.Modality
		if modality == "strength" {
			modality = "other"
		}
		req.Event = &fuel.Event{StartsAt: e.LocalStart(), Modality: modality, DistanceKm: e.DistanceKm,
			ExpectedDurationMin: float64(e.ExpectedDurationMin), IntensityPctVO2max: in.IntensityPct,
			Segments: e.Segments, Stages: e.Stages}
		if len(e.Stages) > 0 {
			req.Event.StartsAt = e.Stages[0].StartsAt.In(e.Location())
		}
		req.CaffeineMgPerKg = in.CaffeineMgPerKg
		req.TimeZone = e.TimeZone
	}
	if in.Kind == fuel.KindRepletion {
		loc := loadZone(in.TimeZone)
		end, err := forms.ParseLocalDateTime(in.SessionEnd, loc)
		if err != nil {
			return req, fuel.ValidationError{{Field: "session_end", Message: "The end of the session must be a date and time like 2027-04-18 09:30."}}
		}
		next, err := forms.ParseLocalDateTime(in.NextStart, loc)
		if err != nil {
			return req, fuel.ValidationError{{Field: "next_start", Message: "The next start must be a date and time like 2027-04-18 15:30."}}
		}
		if !next.After(end) {
			return req, fuel.ValidationError{{Field: "next_start", Message: "The next session must start after the end of this one."}}
		}
		req.SessionEnd, req.NextStart, req.TimeZone = &end, &next, in.TimeZone
	}
	if in.Kind == fuel.KindWeek {
		req.StartDate = web.ISODate(*in.StartDate)
		req.Days = in.Days
		if in.TimeZone != "" {
			req.TimeZone = in.TimeZone
		}
	}
	for _, t := range pi.training {
		modality := t.Modality
		req.Training = append(req.Training, fuel.TrainingSession{Date: web.ISODate(t.OnDate), Start: t.StartTime,
			DurationMin: float64(t.DurationMin), Modality: modality, Intensity: t.FuelIntensity(), TrainLow: t.TrainLow,
			AveragePowerW: t.FuelPowerW()})
	}
	return req, nil
}

// splitCautions turns the client's recorded cautions (free text, one per
// line) into the request's list.
func splitCautions(text string) []string {
	var out []string
	for _, part := range strings.Split(text, "\n") {
		if p := strings.TrimSpace(part); p != "" {
			if r := []rune(p); len(r) > 200 {
				p = string(r[:200])
			}
			out = append(out, p)
		}
	}
	if len(out) > 20 {
		out = out[:20]
	}
	return out
}
