package demo

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"time"

	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
)

// loadDemoPlans adds one published plan of each kind to the demo practice:
// a two-day loading plan for the marathoner's marathon, a race-day plan for
// the cyclist's stage race, a repletion plan between the rower's two
// sessions of a day, and a training week for the triathlete (whose recorded
// diabetes caution shows on it). A plan whose title already exists for its
// client is left alone, so loading twice adds nothing.
func loadDemoPlans(ctx context.Context, st *store.Store, ids IDs) error {
	today := dateOf(Now())
	foods, err := st.ListFoods(ctx, false)
	if err != nil {
		return err
	}
	var mf []menu.Food
	for _, f := range foods {
		mf = append(mf, f.Menu())
	}
	d := demoPlans{ctx: ctx, st: st, foods: mf, today: today}
	if id, ok := ids.Clients["marathoner"]; ok {
		if err := d.eventPlan(id, ids.Events["marathon"], fuel.KindLoading, fuel.ProtocolTwoDay, "Two-day carbohydrate loading for the spring marathon"); err != nil {
			return fmt.Errorf("loading plan: %w", err)
		}
	}
	if id, ok := ids.Clients["cyclist"]; ok {
		if err := d.eventPlan(id, ids.Events["stage-race"], fuel.KindRace, "", "Race-day fuelling for the stage race"); err != nil {
			return fmt.Errorf("race plan: %w", err)
		}
	}
	if id, ok := ids.Clients["rower"]; ok {
		if err := d.repletionPlan(id, ids.Events["head-race"]); err != nil {
			return fmt.Errorf("repletion plan: %w", err)
		}
	}
	if id, ok := ids.Clients["triathlete"]; ok {
		if err := d.weekPlan(id, "Training week"); err != nil {
			return fmt.Errorf("week plan: %w", err)
		}
	}
	return nil
}

type demoPlans struct {
	ctx   context.Context
	st    *store.Store
	foods []menu.Food
	today time.Time
}

// exists reports whether the client already has a plan with this title.
func (d demoPlans) exists(clientID int64, title string) (bool, error) {
	var n int
	err := d.st.Pool.QueryRow(d.ctx, `SELECT count(*) FROM plans WHERE client_id = $1 AND title = $2`, clientID, title).Scan(&n)
	return n > 0, err
}

// athlete reads the body figures the engine needs from the client's records.
func (d demoPlans) athlete(c store.Client) (fuel.Athlete, *time.Time, error) {
	a := fuel.Athlete{Sex: c.Sex, HeightCm: c.HeightCm}
	m, err := d.st.LatestBodyMass(d.ctx, c.ID)
	if err != nil {
		return a, nil, err
	}
	a.BodyMassKg = m.MassKg
	if f, err := d.st.LatestBodyFat(d.ctx, c.ID); err == nil {
		a.BodyFatPct = f.BodyFatPct
	} else if !errors.Is(err, store.ErrNotFound) {
		return a, nil, err
	}
	on := m.MeasuredOn
	return a, &on, nil
}

func (d demoPlans) training(clientID int64, from, to time.Time) ([]fuel.TrainingSession, error) {
	ts, err := d.st.TrainingBetween(d.ctx, clientID, from, to)
	if err != nil {
		return nil, err
	}
	out := make([]fuel.TrainingSession, 0, len(ts))
	for _, t := range ts {
		out = append(out, fuel.TrainingSession{Date: t.OnDate.Format(time.DateOnly), Start: t.StartTime,
			DurationMin: float64(t.DurationMin), Modality: t.Modality, Intensity: t.FuelIntensity(), AveragePowerW: t.FuelPowerW()})
	}
	return out, nil
}

func cautions(text string) []string {
	var out []string
	for _, p := range strings.Split(text, "\n") {
		if p = strings.TrimSpace(p); p != "" {
			if r := []rune(p); len(r) > 200 {
				p = string(r[:200])
			}
			out = append(out, p)
		}
	}
	return out
}

// publish computes the request and stores it as version 1, published.
func (d demoPlans) publish(c store.Client, p store.Plan, req fuel.Request, massOn *time.Time) error {
	req.Cautions = cautions(c.Cautions)
	if req.EatingOccasions == 0 {
		req.EatingOccasions = 5
	}
	plan, err := fuel.Compute(req)
	if err != nil {
		return err
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg, BodyMassOn: massOn,
		Suggestions: menu.PlanSuggestions(plan, d.foods, menu.OptionsForClient(c.Cautions, nil, false))}
	v, err := d.st.CreatePlan(d.ctx, store.System, &p, content)
	if err != nil {
		return err
	}
	_, err = d.st.Publish(d.ctx, store.System, v.ID, v.Revision, content)
	return err
}

func (d demoPlans) eventPlan(clientID, eventID int64, kind, protocol, title string) error {
	if eventID == 0 {
		return nil
	}
	if ok, err := d.exists(clientID, title); err != nil || ok {
		return err
	}
	c, err := d.st.ClientByID(d.ctx, clientID)
	if err != nil {
		return err
	}
	e, err := d.st.EventByID(d.ctx, clientID, eventID)
	if err != nil {
		return err
	}
	ath, massOn, err := d.athlete(c)
	if err != nil {
		return err
	}
	day := dateOf(e.LocalStart())
	last := day
	if n := len(e.Stages); n > 0 {
		last = dateOf(e.Stages[n-1].StartsAt.In(e.Location()))
	}
	training, err := d.training(clientID, day.AddDate(0, 0, -21), last.AddDate(0, 0, 1))
	if err != nil {
		return err
	}
	modality := e.Modality
	if modality == "strength" {
		modality = "other"
	}
	req := fuel.Request{Kind: kind, Protocol: protocol, Athlete: ath, Training: training, TimeZone: e.TimeZone,
		Event: &fuel.Event{StartsAt: e.LocalStart(), Modality: modality, DistanceKm: e.DistanceKm, ExpectedDurationMin: float64(e.ExpectedDurationMin),
			Segments: e.Segments, Stages: e.Stages}}
	if len(e.Stages) > 0 {
		req.Event.StartsAt = e.Stages[0].StartsAt.In(e.Location())
	}
	if kind == fuel.KindLoading {
		req.TaperDays = 7
	}
	p := store.Plan{ClientID: clientID, EventID: &e.ID, Kind: kind, Protocol: protocol, Title: title}
	return d.publish(c, p, req, massOn)
}

// repletionPlan finds the latest day of the rower's log with two sessions
// less than 8 h apart (where speedy refuelling applies) and plans the
// refuelling between them.
func (d demoPlans) repletionPlan(clientID, eventID int64) error {
	const title = "Repletion between the two sessions of a double day"
	if ok, err := d.exists(clientID, title); err != nil || ok {
		return err
	}
	c, err := d.st.ClientByID(d.ctx, clientID)
	if err != nil {
		return err
	}
	zone := "Europe/London"
	if eventID != 0 {
		if e, err := d.st.EventByID(d.ctx, clientID, eventID); err == nil {
			zone = e.TimeZone
		}
	}
	loc, err := time.LoadLocation(zone)
	if err != nil {
		return err
	}
	ts, err := d.st.TrainingBetween(d.ctx, clientID, d.today.AddDate(0, 0, -14), d.today.AddDate(0, 0, 14))
	if err != nil {
		return err
	}
	var end, next *time.Time
	for i := 0; i+1 < len(ts); i++ {
		a, b := ts[i], ts[i+1]
		if !a.OnDate.Equal(b.OnDate) || a.StartTime == "" || b.StartTime == "" {
			continue
		}
		s1, err1 := time.ParseInLocation("2006-01-02 15:04", a.OnDate.Format(time.DateOnly)+" "+a.StartTime, loc)
		s2, err2 := time.ParseInLocation("2006-01-02 15:04", b.OnDate.Format(time.DateOnly)+" "+b.StartTime, loc)
		if err1 != nil || err2 != nil {
			continue
		}
		e1 := s1.Add(time.Duration(a.DurationMin) * time.Minute)
		if e1.Before(s2) && s2.Sub(e1) < 8*time.Hour {
			end, next = &e1, &s2
		}
	}
	if end == nil {
		return nil // no double day in the log: nothing to plan
	}
	ath, massOn, err := d.athlete(c)
	if err != nil {
		return err
	}
	day := dateOf(*end)
	training, err := d.training(clientID, day.AddDate(0, 0, -3), day.AddDate(0, 0, 1))
	if err != nil {
		return err
	}
	req := fuel.Request{Kind: fuel.KindRepletion, Athlete: ath, Training: training, SessionEnd: end, NextStart: next, TimeZone: zone}
	return d.publish(c, store.Plan{ClientID: clientID, Kind: fuel.KindRepletion, Title: title}, req, massOn)
}

func (d demoPlans) weekPlan(clientID int64, title string) error {
	if ok, err := d.exists(clientID, title); err != nil || ok {
		return err
	}
	c, err := d.st.ClientByID(d.ctx, clientID)
	if err != nil {
		return err
	}
	ath, massOn, err := d.athlete(c)
	if err != nil {
		return err
	}
	training, err := d.training(clientID, d.today.AddDate(0, 0, -7), d.today.AddDate(0, 0, 7))
	if err != nil {
		return err
	}
	zone := "UTC"
	if evs, err := d.st.ListEvents(d.ctx, clientID); err == nil && len(evs) > 0 {
		zone = evs[0].TimeZone
	}
	req := fuel.Request{Kind: fuel.KindWeek, Athlete: ath, Training: training, StartDate: d.today.Format(time.DateOnly), Days: 7, TimeZone: zone}
	return d.publish(c, store.Plan{ClientID: clientID, Kind: fuel.KindWeek, Title: title}, req, massOn)
}
