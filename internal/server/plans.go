package server

import (
	"errors"
	"fmt"
	"net/http"
	"net/url"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/go-chi/chi/v5"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/store"
	"larder/web"
)

// Plan pages: start a plan from a client (prefilled from the records), show a
// version with its findings beside each figure, take a dietitian's overrides,
// save the draft under a revision check, publish, revise, list versions.

func (s *Server) mountPlanPages(r chi.Router) {
	r.Get("/assets/plans.css", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "text/css; charset=utf-8")
		w.Header().Set("Cache-Control", "max-age=300")
		_, _ = w.Write(web.PlanCSS)
	})
	r.Get("/assets/plans.js", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "text/javascript; charset=utf-8")
		w.Header().Set("Cache-Control", "max-age=300")
		_, _ = w.Write(web.PlanJS)
	})
	r.Get("/clients/{clientID}/plans/new", s.newPlanPage)
	r.Post("/clients/{clientID}/plans", s.createPlan)
	r.With(s.recordRead(store.ReadPlan)).Get("/clients/{clientID}/plans/{planID}", s.showPlan)
	r.With(s.recordRead(store.ReadPlan)).Get("/clients/{clientID}/plans/{planID}/versions/{version}", s.showPlanVersion)
	r.Post("/clients/{clientID}/plans/{planID}/versions/{version}", s.editPlanVersion)
	r.Post("/clients/{clientID}/plans/{planID}/revise", s.revisePlan)
	r.Post("/clients/{clientID}/plans/{planID}/versions/{version}/discard", s.discardDraft)
}

var planKinds = []web.Option{
	{Value: fuel.KindLoading, Label: "Carbohydrate loading before an event"},
	{Value: fuel.KindRace, Label: "Race day: pre-event meal and in-event fuelling"},
	{Value: fuel.KindRepletion, Label: "Repletion between two sessions"},
	{Value: fuel.KindWeek, Label: "Training week: daily targets by training load"},
}

var planProtocols = []web.Option{
	{Value: fuel.ProtocolTwoDay, Label: "Two-day (36–48 h at 10–12 g/kg)"},
	{Value: fuel.ProtocolOneDay, Label: "One-day (about 10 g/kg in 24 h)"},
	{Value: fuel.ProtocolThreeDay, Label: "Three-day with taper"},
}

func kindLabel(kind string) string {
	switch kind {
	case fuel.KindLoading:
		return "Carbohydrate loading"
	case fuel.KindRace:
		return "Race day"
	case fuel.KindRepletion:
		return "Repletion"
	case fuel.KindWeek:
		return "Training week"
	}
	return kind
}

// staleMassDays: a body mass older than this is flagged on the plan form and page.
const staleMassDays = 14

// planStartForm is the start-a-plan form.
type planStartForm struct {
	Kind            string     `form:"kind" label:"Kind of plan" validate:"required,oneof=loading race repletion week"`
	Title           string     `form:"title" label:"Title" validate:"max=200"`
	EventID         int        `form:"event_id" label:"Event" validate:"gte=0"`
	Protocol        string     `form:"protocol" label:"Loading protocol" validate:"omitempty,oneof=two-day one-day three-day"`
	TaperDays       int        `form:"taper_days" label:"Days before the event covered" validate:"gte=0,lte=14"`
	IntensityPct    *float64   `form:"intensity_pct" label:"Race intensity" unit:"% VO2max" validate:"omitempty,gte=20,lte=100"`
	BodyMassKg      *float64   `form:"body_mass_kg" label:"Body mass" unit:"kg" validate:"required,gte=25,lte=250"`
	BodyMassOn      *time.Time `form:"body_mass_on" label:"Date of the body mass"`
	BodyMassPrefill string     `form:"body_mass_prefill"`
	BodyFatPct      *float64   `form:"body_fat_pct" label:"Body fat" unit:"%" validate:"omitempty,gte=3,lte=60"`
	HeightCm        *float64   `form:"height_cm" label:"Height" unit:"cm" validate:"omitempty,gte=120,lte=230"`
	VO2max          *float64   `form:"vo2max" label:"VO2max" unit:"ml/kg/min" validate:"omitempty,gte=20,lte=95"`
	EatingOccasions int        `form:"eating_occasions" label:"Eating occasions a day" validate:"gte=1,lte=10"`
	SessionEnd      string     `form:"session_end" label:"Session end" validate:"omitempty,localdatetime"`
	NextStart       string     `form:"next_start" label:"Next session start" validate:"omitempty,localdatetime"`
	TimeZone        string     `form:"time_zone" label:"Time zone" validate:"omitempty,iana_zone"`
	StartDate       *time.Time `form:"start_date" label:"First day"`
	Days            int        `form:"days" label:"Number of days" validate:"gte=0,lte=28"`
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
	if m, err := s.Store.LatestBodyMass(r.Context(), c.ID); err == nil {
		v.Set("body_mass_kg", web.Num(m.MassKg, 2))
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
	zone := "UTC"
	if e := nextEvent(events, s.Now()); e != nil {
		zone = e.TimeZone
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
	if loc, err := time.LoadLocation(name); err == nil && name != "" {
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
			Distance: "—", Duration: hoursWords(float64(e.ExpectedDurationMin)), Priority: e.Priority}
		if e.DistanceKm != nil {
			l.Distance = web.Num(*e.DistanceKm, 3) + " km"
		}
		lines = append(lines, l)
	}
	v := web.PlanStartView{
		ClientID: c.ID, ClientName: c.Name, ClientCautions: c.Cautions, Sex: c.Sex,
		Events: opts, EventLines: lines, Kinds: planKinds, Protocols: planProtocols, Caution: fuel.Caution, Form: f,
	}
	if on, err := time.Parse(forms.DateLayout, f.Get("body_mass_on")); err == nil {
		v.BodyMassNote = "Latest measurement: " + f.Get("body_mass_prefill") + " kg on " + web.Date(on) + "."
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
			ExpectedDurationMin: float64(e.ExpectedDurationMin), IntensityPctVO2max: in.IntensityPct}
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
			DurationMin: float64(t.DurationMin), Modality: modality, Intensity: t.FuelIntensity()})
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

// mapRequestError puts the engine's field errors beside the form's inputs.
func mapRequestError(f forms.Form, err error) {
	var ve fuel.ValidationError
	if !errors.As(err, &ve) {
		f.Errors.Add("general", "The plan could not be computed: "+err.Error())
		return
	}
	names := map[string]string{
		"athlete.body_mass_kg": "body_mass_kg", "athlete.height_cm": "height_cm", "athlete.body_fat_pct": "body_fat_pct",
		"athlete.vo2max_ml_kg_min": "vo2max", "event.intensity_pct_vo2max": "intensity_pct", "protocol": "protocol",
		"session_end": "session_end", "next_start": "next_start", "time_zone": "time_zone", "start_date": "start_date",
		"days": "days", "taper_days": "taper_days", "eating_occasions": "eating_occasions",
	}
	for _, fe := range ve {
		name, ok := names[fe.Field]
		if !ok && strings.HasPrefix(fe.Field, "event") {
			name, ok = "event_id", true
		}
		if !ok {
			name = "general"
		}
		f.Errors.Add(name, fieldWords(fe))
	}
}

// engineWords replaces the engine's field keys, which it names for the
// JSON API, with the words the form uses.
var engineWords = strings.NewReplacer(
	"session_end", "the end of the session",
	"cho_g_per_kg", "carbohydrate g/kg",
	"eating_occasions", "eating occasions",
)

// recordWords names, in the form's words, the record a field error of the
// engine is about when that record is edited on the client's page.
func recordWords(field string) (string, bool) {
	switch {
	case strings.HasPrefix(field, "training"):
		return "A session in the training log", true
	case field == "event.distance_km":
		return "The event's distance", true
	case field == "event.expected_duration_min":
		return "The event's expected duration", true
	case field == "event.starts_at":
		return "The event's start", true
	case strings.HasPrefix(field, "event"):
		return "The event", true
	}
	return "", false
}

// fieldWords phrases an engine field error as a sentence.
func fieldWords(fe fuel.FieldError) string {
	msg := engineWords.Replace(fe.Message)
	if !strings.HasSuffix(msg, ".") {
		msg += "."
	}
	if who, ok := recordWords(fe.Field); ok {
		return who + " " + msg + " Change it on the client's page."
	}
	if msg != "" {
		msg = strings.ToUpper(msg[:1]) + msg[1:]
	}
	return msg
}

// ----- showing a plan -----

func (s *Server) planFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.Plan, bool) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return c, store.Plan{}, false
	}
	id, ok := s.ParamID(w, r, "planID")
	if !ok {
		return c, store.Plan{}, false
	}
	p, err := s.Store.PlanByID(r.Context(), c.ID, id)
	if err != nil {
		s.StoreError(w, r, err)
		return c, p, false
	}
	return c, p, true
}

func (s *Server) showPlan(w http.ResponseWriter, r *http.Request) {
	c, p, ok := s.planFromURL(w, r)
	if !ok {
		return
	}
	versions, err := s.Store.PlanVersions(r.Context(), p.ID)
	if err != nil || len(versions) == 0 {
		s.ServerError(w, r, fmt.Errorf("plan %d versions: %v", p.ID, err))
		return
	}
	cur := versions[0]
	for _, v := range versions {
		if v.Status == store.PlanDraft {
			cur = v
		}
	}
	s.renderPlan(w, r, http.StatusOK, c, p, cur, versions, overrideValues(cur.Request), "")
}

func (s *Server) versionFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.Plan, store.PlanVersion, []store.PlanVersion, bool) {
	c, p, ok := s.planFromURL(w, r)
	if !ok {
		return c, p, store.PlanVersion{}, nil, false
	}
	n, err := strconv.Atoi(chi.URLParam(r, "version"))
	if err != nil || n < 1 {
		s.NotFound(w, r)
		return c, p, store.PlanVersion{}, nil, false
	}
	versions, err := s.Store.PlanVersions(r.Context(), p.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return c, p, store.PlanVersion{}, nil, false
	}
	for _, v := range versions {
		if v.Version == n {
			return c, p, v, versions, true
		}
	}
	s.NotFound(w, r)
	return c, p, store.PlanVersion{}, nil, false
}

func (s *Server) showPlanVersion(w http.ResponseWriter, r *http.Request) {
	c, p, v, versions, ok := s.versionFromURL(w, r)
	if !ok {
		return
	}
	s.renderPlan(w, r, http.StatusOK, c, p, v, versions, overrideValues(v.Request), "")
}

func (s *Server) renderPlan(w http.ResponseWriter, r *http.Request, status int, c store.Client, p store.Plan, v store.PlanVersion,
	versions []store.PlanVersion, f forms.Form, notice string) {
	stored, err := s.Store.FeedSuggestions(r.Context(), v.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	pv := s.planView(c, p, v, versions, stored)
	pv.Form = f
	pv.Notice = notice
	if !pv.Editable && notice != "" {
		pv.Carry = carriedValues(f)
	}
	if pv.Editable && notice != "" {
		pv.Theirs = differing(f, overrideValues(v.Request))
	}
	s.Render(w, r, status, p.Title, "clients", web.PlanPage(pv))
}

// ----- editing a draft -----

// Override inputs are named after the value they set:
//
//	gkg_2027-04-16        a day's carbohydrate g/kg
//	occ_2027-04-16        a day's eating occasions
//	feedcho_2027-04-16_2  the carbohydrate g of the day's third feed
//	feedat_2027-04-16_2   its time (HH:MM)
//	during_gph            the in-event g/h
//
// An empty input means "no override": the computed value stands.

func gkgName(date string) string            { return "gkg_" + date }
func occName(date string) string            { return "occ_" + date }
func feedChoName(date string, i int) string { return fmt.Sprintf("feedcho_%s_%d", date, i) }
func feedAtName(date string, i int) string  { return fmt.Sprintf("feedat_%s_%d", date, i) }

const duringName = "during_gph"

// Inputs of a draft's body figures: prefilled with the values used (not
// overrides: the plan is recomputed from them as from the start form).
const (
	massName = "in_body_mass_kg"
	fatName  = "in_body_fat_pct"
)

// overrideValues fills the override inputs from a request's overrides.
func overrideValues(req fuel.Request) forms.Form {
	v := url.Values{}
	for _, o := range req.Overrides {
		if o.ChoGPerKg != nil {
			v.Set(gkgName(o.Date), web.Num(*o.ChoGPerKg, 2))
		}
		if o.EatingOccasions != nil {
			v.Set(occName(o.Date), strconv.Itoa(*o.EatingOccasions))
		}
	}
	for _, o := range req.FeedOverrides {
		if o.ChoG != nil {
			v.Set(feedChoName(o.Date, o.Index), web.Num(*o.ChoG, 1))
		}
		if o.At != "" {
			v.Set(feedAtName(o.Date, o.Index), o.At)
		}
	}
	if req.DuringEventChoGPerH != nil {
		v.Set(duringName, web.Num(*req.DuringEventChoGPerH, 1))
	}
	v.Set(massName, web.Num(req.Athlete.BodyMassKg, 2))
	if req.Athlete.BodyFatPct != nil {
		v.Set(fatName, web.Num(*req.Athlete.BodyFatPct, 1))
	}
	return forms.FromValues(v)
}

// decodeOverrides reads the override inputs into a copy of req. Inputs are
// checked against the engine's own limits; each bad one gets its message.
func decodeOverrides(values url.Values, req fuel.Request) (fuel.Request, forms.Form) {
	f := forms.FromValues(values)
	days := map[string]*fuel.DayOverride{}
	feeds := map[string]*fuel.FeedOverride{}
	var dayOrder, feedOrder []string
	day := func(date string) *fuel.DayOverride {
		if days[date] == nil {
			days[date] = &fuel.DayOverride{Date: date}
			dayOrder = append(dayOrder, date)
		}
		return days[date]
	}
	feed := func(date string, i int) *fuel.FeedOverride {
		k := fmt.Sprintf("%s_%d", date, i)
		if feeds[k] == nil {
			feeds[k] = &fuel.FeedOverride{Date: date, Index: i}
			feedOrder = append(feedOrder, k)
		}
		return feeds[k]
	}
	number := func(name, raw string, lo, hi float64, what, unit string) (float64, bool) {
		x, err := forms.ParseNumber(raw)
		if err != nil || x < lo || x > hi {
			f.Errors.Add(name, fmt.Sprintf("%s must be a number from %s to %s %s.", what, web.Num(lo, 1), web.Num(hi, 1), unit))
			return 0, false
		}
		return x, true
	}
	names := make([]string, 0, len(values))
	for name := range values {
		names = append(names, name)
	}
	sort.Strings(names)
	req.DuringEventChoGPerH = nil
	// The body figures change only when their inputs were sent.
	if _, sent := values[massName]; sent {
		if x, ok := number(massName, values.Get(massName), 25, 250, "Body mass", "kg"); ok {
			req.Athlete.BodyMassKg = x
		}
	}
	if _, sent := values[fatName]; sent {
		if raw := strings.TrimSpace(values.Get(fatName)); raw == "" {
			req.Athlete.BodyFatPct = nil
		} else if x, ok := number(fatName, raw, 3, 60, "Body fat", "%"); ok {
			req.Athlete.BodyFatPct = &x
		}
	}
	for _, name := range names {
		raw := strings.TrimSpace(values.Get(name))
		if raw == "" {
			continue
		}
		switch {
		case name == duringName:
			if x, ok := number(name, raw, 0, 150, "In-event carbohydrate", "g/h"); ok {
				req.DuringEventChoGPerH = &x
			}
		case strings.HasPrefix(name, "gkg_"):
			date, ok := overrideDate(strings.TrimPrefix(name, "gkg_"))
			if !ok {
				continue
			}
			if x, ok := number(name, raw, 0, 20, "Carbohydrate on "+dayWords(date), "g/kg"); ok {
				day(date).ChoGPerKg = &x
			}
		case strings.HasPrefix(name, "occ_"):
			date, ok := overrideDate(strings.TrimPrefix(name, "occ_"))
			if !ok {
				continue
			}
			n, err := strconv.Atoi(raw)
			if err != nil || n < 1 || n > 10 {
				f.Errors.Add(name, "Eating occasions on "+dayWords(date)+" must be a whole number from 1 to 10.")
				continue
			}
			day(date).EatingOccasions = &n
		case strings.HasPrefix(name, "feedcho_"), strings.HasPrefix(name, "feedat_"):
			rest := name[strings.Index(name, "_")+1:]
			date, idx, ok := feedKey(rest)
			if !ok {
				continue
			}
			if strings.HasPrefix(name, "feedcho_") {
				if x, ok := number(name, raw, 0, 1000, "Carbohydrate of this feed", "g"); ok {
					feed(date, idx).ChoG = &x
				}
			} else {
				t, err := time.Parse("15:04", raw)
				if err != nil {
					f.Errors.Add(name, "The time of this feed must be a time of day like 07:30.")
					continue
				}
				feed(date, idx).At = t.Format("15:04")
			}
		}
	}
	req.Overrides = nil
	for _, d := range dayOrder {
		req.Overrides = append(req.Overrides, *days[d])
	}
	req.FeedOverrides = nil
	for _, k := range feedOrder {
		req.FeedOverrides = append(req.FeedOverrides, *feeds[k])
	}
	return req, f
}

func overrideDate(s string) (string, bool) {
	_, err := time.Parse(time.DateOnly, s)
	return s, err == nil
}

func feedKey(s string) (string, int, bool) {
	date, idx, ok := strings.Cut(s, "_")
	if !ok {
		return "", 0, false
	}
	if _, ok := overrideDate(date); !ok {
		return "", 0, false
	}
	i, err := strconv.Atoi(idx)
	if err != nil || i < 0 || i > 30 {
		return "", 0, false
	}
	return date, i, true
}

func dayWords(date string) string {
	t, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return date
	}
	return t.Format("Mon 2 Jan")
}

func (s *Server) editPlanVersion(w http.ResponseWriter, r *http.Request) {
	c, p, v, versions, ok := s.versionFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	action := r.PostForm.Get("action")
	revision, err := strconv.Atoi(r.PostForm.Get("revision"))
	if err != nil {
		http.Error(w, "The form is missing its revision; reload the page.", http.StatusBadRequest)
		return
	}
	values := overrideInputs(r.PostForm)
	req, f := decodeOverrides(values, v.Request)
	if v.Status != store.PlanDraft {
		s.renderPlan(w, r, http.StatusConflict, c, p, v, versions, f,
			"Not saved: this version is "+v.Status+" and can no longer change. Your values are listed here; start a new version to apply them.")
		return
	}
	if f.Has() {
		s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, "")
		return
	}
	plan, err := fuel.Compute(req)
	if err != nil {
		var ve fuel.ValidationError
		if errors.As(err, &ve) {
			for _, fe := range ve {
				f.Errors.Add(overrideField(fe, req), fieldWords(fe))
			}
			s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, "")
			return
		}
		s.ServerError(w, r, err)
		return
	}
	sugg, err := s.planSuggestions(r.Context(), c, plan)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg, BodyMassOn: v.BodyMassOn,
		Suggestions: sugg}
	if req.Athlete.BodyMassKg != v.BodyMassKg {
		// A new figure: dated when it is the latest measurement on record.
		content.BodyMassOn = nil
		if m, err := s.Store.LatestBodyMass(r.Context(), c.ID); err == nil && m.MassKg == req.Athlete.BodyMassKg {
			content.BodyMassOn = &m.MeasuredOn
		}
	}
	var saved store.PlanVersion
	if action == "publish" {
		saved, err = s.Store.Publish(r.Context(), Actor(r), v.ID, revision, content)
	} else {
		saved, err = s.Store.SaveDraft(r.Context(), Actor(r), v.ID, revision, content)
	}
	switch {
	case errors.Is(err, store.ErrStaleRevision), errors.Is(err, store.ErrNotDraft):
		s.conflict(w, r, c, p, v, f, err)
		return
	case err != nil:
		s.ServerError(w, r, err)
		return
	}
	if action == "publish" {
		s.Flash(r, "Version "+strconv.Itoa(saved.Version)+" published. It is what the client sees and the sheet prints.")
	} else {
		s.Flash(r, "Draft saved and checked again.")
	}
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", saved.Version))
}

// differing lists, for each override input, the saved value where it is not
// what the person typed ("none" where the saved version has no override).
func differing(typed, saved forms.Form) map[string]string {
	out := map[string]string{}
	seen := map[string]bool{}
	for name := range overrideInputs(typed.Values) {
		seen[name] = true
	}
	for name := range overrideInputs(saved.Values) {
		seen[name] = true
	}
	for name := range seen {
		t, s := strings.TrimSpace(typed.Get(name)), strings.TrimSpace(saved.Get(name))
		if t != s {
			if s == "" {
				s = "none (computed)"
			}
			out[name] = s
		}
	}
	return out
}

// carriedValues lists the override values a person typed, in words, for a
// version that can no longer take them.
func carriedValues(f forms.Form) []web.Carried {
	names := make([]string, 0, len(f.Values))
	for name := range overrideInputs(f.Values) {
		if strings.TrimSpace(f.Values.Get(name)) != "" {
			names = append(names, name)
		}
	}
	sort.Strings(names)
	var out []web.Carried
	for _, name := range names {
		label := name
		switch {
		case name == duringName:
			label = "In-event carbohydrate (g/h)"
		case name == massName:
			label = "Body mass (kg)"
		case name == fatName:
			label = "Body fat (%)"
		case strings.HasPrefix(name, "gkg_"):
			label = "Carbohydrate on " + dayWords(strings.TrimPrefix(name, "gkg_")) + " (g/kg)"
		case strings.HasPrefix(name, "occ_"):
			label = "Eating occasions on " + dayWords(strings.TrimPrefix(name, "occ_"))
		case strings.HasPrefix(name, "feedcho_"), strings.HasPrefix(name, "feedat_"):
			if date, i, ok := feedKey(name[strings.Index(name, "_")+1:]); ok {
				what := "Carbohydrate (g)"
				if strings.HasPrefix(name, "feedat_") {
					what = "Time"
				}
				label = fmt.Sprintf("%s of feed %d on %s", what, i+1, dayWords(date))
			}
		}
		out = append(out, web.Carried{Name: name, Label: label, Value: f.Values.Get(name)})
	}
	return out
}

// overrideInputs keeps only the override inputs of a posted form.
func overrideInputs(form url.Values) url.Values {
	v := url.Values{}
	for name, vals := range form {
		if name == duringName || name == massName || name == fatName || strings.HasPrefix(name, "gkg_") || strings.HasPrefix(name, "occ_") ||
			strings.HasPrefix(name, "feedcho_") || strings.HasPrefix(name, "feedat_") {
			v[name] = vals
		}
	}
	return v
}

// overrideField names the input an engine error on an override concerns.
func overrideField(fe fuel.FieldError, req fuel.Request) string {
	var i int
	var rest string
	if n, _ := fmt.Sscanf(fe.Field, "overrides[%d].%s", &i, &rest); n == 2 && i < len(req.Overrides) {
		if strings.HasPrefix(rest, "eating") {
			return occName(req.Overrides[i].Date)
		}
		return gkgName(req.Overrides[i].Date)
	}
	if n, _ := fmt.Sscanf(fe.Field, "feed_overrides[%d].%s", &i, &rest); n == 2 && i < len(req.FeedOverrides) {
		o := req.FeedOverrides[i]
		if strings.HasPrefix(rest, "at") {
			return feedAtName(o.Date, o.Index)
		}
		return feedChoName(o.Date, o.Index)
	}
	if fe.Field == "during_event_cho_g_per_h" {
		return duringName
	}
	return "general"
}

// conflict answers a save that lost the race: nothing was written; the
// page shows the version as it now stands, with the user's own values still
// in the inputs (so nothing is lost) and the latest revision to save against.
func (s *Server) conflict(w http.ResponseWriter, r *http.Request, c store.Client, p store.Plan, mine store.PlanVersion, f forms.Form, cause error) {
	versions, err := s.Store.PlanVersions(r.Context(), p.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	latest := mine
	for _, v := range versions {
		if v.ID == mine.ID {
			latest = v
		}
	}
	who := latest.UpdatedByName
	if who == "" {
		who = "someone else"
	}
	when := latest.UpdatedAt.In(loadZone(latest.Result.TimeZone)).Format("15:04 on Mon 2 Jan")
	msg := fmt.Sprintf("Not saved: %s saved this draft at %s, after you opened it. The figures below are theirs; your own values are still in the boxes. Check them against the new figures and save again.", who, when)
	if errors.Is(cause, store.ErrNotDraft) {
		msg = fmt.Sprintf("Not saved: this version was published meanwhile (by %s at %s). Your values are listed here; start a new version to apply them.", who, when)
	}
	s.renderPlan(w, r, http.StatusConflict, c, p, latest, versions, f, msg)
}

func (s *Server) revisePlan(w http.ResponseWriter, r *http.Request) {
	c, p, ok := s.planFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	pub, err := s.Store.PublishedPlanVersion(r.Context(), p.ID)
	if err != nil {
		s.StoreError(w, r, err)
		return
	}
	// The new draft's food suggestions are made afresh from today's foods
	// list (a food archived since is no longer offered), once, here.
	fresh, err := s.planSuggestions(r.Context(), c, pub.Result)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	v, err := s.Store.NewVersionWith(r.Context(), Actor(r), p.ID, pub.ID, fresh)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	msg := "Version " + strconv.Itoa(v.Version) + " started as a draft copy of version " + strconv.Itoa(pub.Version) + "."
	if v.Version != pub.Version+1 || v.Revision != 1 {
		msg = "This plan already has a draft (version " + strconv.Itoa(v.Version) + "); it is opened instead."
	}
	// Values carried over from a refused edit of a published version are
	// applied to the new draft, so that nothing typed is lost.
	if values := overrideInputs(r.PostForm); len(values) > 0 {
		req, f := decodeOverrides(values, v.Request)
		plan, cerr := fuel.Compute(req)
		if f.Has() || cerr != nil {
			versions, err := s.Store.PlanVersions(r.Context(), p.ID)
			if err != nil {
				s.ServerError(w, r, err)
				return
			}
			s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, msg+" Your values were not applied: correct the boxes marked below and save.")
			return
		}
		sugg, err := s.planSuggestions(r.Context(), c, plan)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		content := store.PlanContent{Request: req, Result: plan, BodyMassKg: v.BodyMassKg, BodyMassOn: v.BodyMassOn,
			Suggestions: sugg}
		if _, err := s.Store.SaveDraft(r.Context(), Actor(r), v.ID, v.Revision, content); err != nil {
			if errors.Is(err, store.ErrStaleRevision) || errors.Is(err, store.ErrNotDraft) {
				s.conflict(w, r, c, p, v, f, err)
				return
			}
			s.ServerError(w, r, err)
			return
		}
		msg += " Your values were applied and checked."
	}
	s.Flash(r, msg)
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version))
}

func (s *Server) discardDraft(w http.ResponseWriter, r *http.Request) {
	c, p, v, versions, ok := s.versionFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	revision, err := strconv.Atoi(r.PostForm.Get("revision"))
	if err != nil {
		http.Error(w, "The form is missing its revision; reload the page.", http.StatusBadRequest)
		return
	}
	gone, err := s.Store.DiscardDraft(r.Context(), Actor(r), v.ID, revision)
	switch {
	case errors.Is(err, store.ErrStaleRevision):
		s.renderPlan(w, r, http.StatusConflict, c, p, v, versions, overrideValues(v.Request),
			"Not discarded: someone saved this draft after you opened it. Look at their changes before discarding it.")
		return
	case errors.Is(err, store.ErrNotDraft):
		s.renderPlan(w, r, http.StatusConflict, c, p, v, versions, overrideValues(v.Request),
			"Not discarded: this version is no longer a draft. Published versions are kept.")
		return
	case err != nil:
		s.ServerError(w, r, err)
		return
	}
	if gone {
		s.Flash(r, "Draft discarded; the plan had no other version, so it is gone.")
		Redirect(w, r, web.Path("clients", c.ID))
		return
	}
	s.Flash(r, "Draft version "+strconv.Itoa(v.Version)+" discarded. Earlier versions are unchanged.")
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID))
}
