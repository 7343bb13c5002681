// Package demo owns the invented demo practice: a staff login, five
// fictional athletes with weeks of body mass and training, and their
// upcoming events, all dated relative to today so the demo never goes
// stale. Every name and race is made up for this project.
//
// Loading is idempotent: each row has a natural key (the login's email; a
// client's name and sex; a measurement's date; a session's date, start and
// modality; an event's name) and is inserted only when absent, so
// running the loader twice adds nothing the second time and never touches
// what a person has edited since.
package demo

import (
	"context"
	"fmt"
	"math"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/auth"
	"larder/internal/fuel"
	"larder/internal/store"
)

// Email is the demo staff login.
const Email = "demo@example.org"

// PracticeName is the demo practice's name, set unless one is already set.
const PracticeName = "Demo practice"

// IDs names the demo's rows for later loaders (plans).
type IDs struct {
	UserID  int64
	Clients map[string]int64 // "marathoner", "cyclist", "rower", "triathlete", "trail"
	Events  map[string]int64 // "marathon", "half", "stage-race", "head-race", "triathlon", "ultra"
}

// Result reports what a load did.
type Result struct {
	Email    string
	Password string // the password set now; "" when an existing login kept its own
	Inserted int    // rows added by this run (0 on a repeat run the same day)
	IDs      IDs
}

// Now is the loader's clock (tests fix it).
var Now = time.Now

// Load loads the demo practice and returns the login to print. With an
// empty password a new login gets a generated one; an existing login keeps
// its password unless one is given.
func Load(ctx context.Context, st *store.Store, password string) (login string, err error) {
	res, err := Run(ctx, st, password)
	if err != nil {
		return "", err
	}
	if res.Password == "" {
		return res.Email + " (password unchanged; run with --password to set a new one)", nil
	}
	return res.Email + " / password: " + res.Password, nil
}

// Run is Load with the full result.
func Run(ctx context.Context, st *store.Store, password string) (Result, error) {
	res := Result{Email: Email, IDs: IDs{Clients: map[string]int64{}, Events: map[string]int64{}}}
	today := dateOf(Now())
	err := st.InTx(ctx, func(tx pgx.Tx) error {
		l := &loader{ctx: ctx, tx: tx, today: today, res: &res}
		if err := l.user(password); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `INSERT INTO settings (key, value) VALUES ($1, $2) ON CONFLICT (key) DO NOTHING`,
			store.SettingPracticeName, PracticeName); err != nil {
			return err
		}
		if err := l.foods(); err != nil {
			return fmt.Errorf("demo foods: %w", err)
		}
		for _, a := range athletes() {
			if err := l.athlete(a); err != nil {
				return fmt.Errorf("demo athlete %s: %w", a.key, err)
			}
		}
		if res.Inserted > 0 {
			return store.AuditTx(ctx, tx, store.System, "load", "demo", 0, map[string]any{"rows_inserted": res.Inserted})
		}
		return nil
	})
	if err != nil {
		return Result{}, err
	}
	if err := loadDemoPlans(ctx, st, res.IDs); err != nil {
		return Result{}, fmt.Errorf("demo plans: %w", err)
	}
	return res, nil
}

func dateOf(t time.Time) time.Time {
	y, m, d := t.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
}

type loader struct {
	ctx   context.Context
	tx    pgx.Tx
	today time.Time
	res   *Result
}

func (l *loader) user(password string) error {
	var id int64
	err := l.tx.QueryRow(l.ctx, `SELECT id FROM users WHERE lower(email) = lower($1)`, Email).Scan(&id)
	switch {
	case err == pgx.ErrNoRows:
		if password == "" {
			password = auth.GeneratePassword()
		}
		hash, err := auth.HashPassword(password)
		if err != nil {
			return err
		}
		if err := l.tx.QueryRow(l.ctx, `INSERT INTO users (email, name, password_hash, role) VALUES ($1, 'Demo Dietitian', $2, 'admin') RETURNING id`,
			Email, hash).Scan(&id); err != nil {
			return err
		}
		if err := store.AuditTx(l.ctx, l.tx, store.System, "create", "user", id, map[string]any{"email": Email, "role": "admin", "by": "demo"}); err != nil {
			return err
		}
		l.res.Password = password
		l.res.Inserted++
	case err != nil:
		return err
	case password != "":
		hash, err := auth.HashPassword(password)
		if err != nil {
			return err
		}
		if _, err := l.tx.Exec(l.ctx, `UPDATE users SET password_hash = $2, disabled = false, role = 'admin' WHERE id = $1`, id, hash); err != nil {
			return err
		}
		if err := store.AuditTx(l.ctx, l.tx, store.System, "set_password", "user", id, map[string]any{"by": "demo"}); err != nil {
			return err
		}
		l.res.Password = password
	}
	l.res.IDs.UserID = id
	return nil
}

func (l *loader) athlete(a athlete) error {
	dob := l.today.AddDate(-a.age, -a.birthMonthsAgo, 0)
	// The date of birth is part of the natural key, so it must not move
	// from day to day: pin it to the first of its month.
	dob = time.Date(dob.Year(), dob.Month(), 1, 0, 0, 0, 0, time.UTC)
	var id int64
	err := l.tx.QueryRow(l.ctx, `SELECT id FROM clients WHERE name = $1 AND sex = $2 ORDER BY id LIMIT 1`, a.name, a.sex).Scan(&id)
	if err == pgx.ErrNoRows {
		if err := l.tx.QueryRow(l.ctx, `INSERT INTO clients (name, date_of_birth, sex, height_cm, sport, notes, cautions)
			VALUES ($1, $2, $3, $4, $5, $6, $7) RETURNING id`, a.name, dob, a.sex, a.heightCm, a.sport, a.notes, a.cautions).Scan(&id); err != nil {
			return err
		}
		if err := store.AuditTx(l.ctx, l.tx, store.System, "create", "client", id, map[string]any{"name": a.name, "by": "demo"}); err != nil {
			return err
		}
		l.res.Inserted++
	} else if err != nil {
		return err
	}
	l.res.IDs.Clients[a.key] = id

	for _, m := range a.masses(l.today) {
		tag, err := l.tx.Exec(l.ctx, `INSERT INTO body_mass (client_id, measured_on, mass_kg, body_fat_pct, method, entered_unit)
			SELECT $1, $2, $3, $4, $5, $6 WHERE NOT EXISTS (SELECT 1 FROM body_mass WHERE client_id = $1 AND measured_on = $2)`,
			id, m.on, m.kg, m.fatPct, m.method, a.unit)
		if err != nil {
			return err
		}
		l.res.Inserted += int(tag.RowsAffected())
	}
	for _, t := range a.sessions(l.today) {
		status := store.StatusDone
		if t.on.After(l.today) {
			status = store.StatusPlanned
		}
		var value *float64
		var zone *string
		if t.kind == store.IntensityZone {
			zone = &t.zone
		} else {
			value = &t.value
		}
		tag, err := l.tx.Exec(l.ctx, `INSERT INTO training_sessions (client_id, on_date, start_time, modality, duration_min,
			intensity_kind, intensity_value, intensity_zone, distance_km, status, notes)
			SELECT $1, $2, $3::time, $4, $5, $6, $7, $8, $9, $10, $11
			WHERE NOT EXISTS (SELECT 1 FROM training_sessions WHERE client_id = $1 AND on_date = $2
				AND start_time IS NOT DISTINCT FROM $3::time AND modality = $4)`,
			id, t.on, t.start, t.modality, t.min, t.kind, value, zone, t.km, status, t.notes)
		if err != nil {
			return err
		}
		l.res.Inserted += int(tag.RowsAffected())
	}
	for _, e := range a.events {
		loc, err := time.LoadLocation(e.zone)
		if err != nil {
			return err
		}
		day := l.today.AddDate(0, 0, e.inDays)
		start := time.Date(day.Year(), day.Month(), day.Day(), e.hour, e.minute, 0, 0, loc)
		var eid int64
		err = l.tx.QueryRow(l.ctx, `SELECT id FROM events WHERE client_id = $1 AND name = $2`, id, e.name).Scan(&eid)
		if err == pgx.ErrNoRows {
			if err := l.tx.QueryRow(l.ctx, `INSERT INTO events (client_id, name, starts_at, time_zone, modality, distance_km,
				expected_duration_min, days, priority, notes) VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10) RETURNING id`,
				id, e.name, start, e.zone, e.modality, e.km, e.min, e.days, e.priority, e.notes).Scan(&eid); err != nil {
				return err
			}
			l.res.Inserted++
		} else if err != nil {
			return err
		}
		if len(e.stages) > 0 {
			// Stages are added to a race loaded before they were known.
			if _, err := l.tx.Exec(l.ctx, `UPDATE events SET stages = $2 WHERE id = $1 AND stages = '[]'`, eid, e.stagesFrom(start)); err != nil {
				return err
			}
		}
		if len(e.legs) > 0 {
			// Legs are added to an event loaded before they were known.
			if _, err := l.tx.Exec(l.ctx, `UPDATE events SET segments = $2 WHERE id = $1 AND segments = '[]' AND stages = '[]'`, eid, e.legs); err != nil {
				return err
			}
		}
		l.res.IDs.Events[e.key] = eid
	}
	return nil
}

type athlete struct {
	key, name, sex, sport, notes, cautions, unit string
	age, birthMonthsAgo                          int
	heightCm                                     float64
	baseKg, trendKgPerWeek                       float64 // body mass 8 weeks ago and its weekly drift
	fatPct                                       float64 // 0: not measured
	fatMethod, method                            string
	week                                         func(weekday time.Weekday, weeksToGo int) []session
	events                                       []event
}

type measurement struct {
	on     time.Time
	kg     float64
	fatPct *float64
	method string
}

type session struct {
	on       time.Time
	start    *string
	modality string
	min      int
	kind     string
	value    float64
	zone     string
	km       *float64
	notes    string
}

type event struct {
	key, name, zone, modality, priority, notes string
	inDays, hour, minute, min, days            int
	km                                         *float64
	// stages, for a stage race: each stage from the first one's start.
	stages []demoStage
	// legs, for a multi-sport event: its legs in race order.
	legs []fuel.Segment
}

// demoStage is one stage of a demo stage race: days and clock time after
// the first stage's day, distance, duration and mean power.
type demoStage struct {
	day, hour, minute int
	km, min, watts    float64
}

// stagesFrom turns a demo race's stages into the engine's.
func (e event) stagesFrom(first time.Time) []fuel.Stage {
	out := make([]fuel.Stage, 0, len(e.stages))
	for _, s := range e.stages {
		d := first.AddDate(0, 0, s.day)
		km, w := s.km, s.watts
		out = append(out, fuel.Stage{StartsAt: time.Date(d.Year(), d.Month(), d.Day(), s.hour, s.minute, 0, 0, first.Location()),
			Modality: e.modality, DistanceKm: &km, ExpectedDurationMin: s.min, AveragePowerW: &w})
	}
	return out
}

// masses gives a measurement every 3-4 days over the last 8 weeks: a
// steady drift plus a small fixed wobble, as scales show day to day.
func (a athlete) masses(today time.Time) []measurement {
	var out []measurement
	for i, d := 0, -56; d <= 0; i, d = i+1, d+[]int{3, 4}[i%2] {
		kg := a.baseKg + a.trendKgPerWeek*float64(d+56)/7 + 0.35*math.Sin(float64(i)*1.7)
		m := measurement{on: today.AddDate(0, 0, d), kg: math.Round(kg*10) / 10, method: a.method}
		if a.fatPct > 0 && i%8 == 0 {
			f := a.fatPct - 0.2*float64(i/8)
			m.fatPct = &f
			m.method = a.fatMethod
		}
		out = append(out, m)
	}
	return out
}

// sessions gives 6 weeks of done training and the planned sessions up to
// the athlete's last event (at most 10 weeks ahead).
func (a athlete) sessions(today time.Time) []session {
	last := 14
	for _, e := range a.events {
		if e.inDays > last {
			last = e.inDays
		}
	}
	var out []session
	for d := -42; d < last; d++ {
		day := today.AddDate(0, 0, d)
		weeksToGo := (last - d) / 7
		week := a.week(day.Weekday(), weeksToGo)
		if t, ok := a.taper(d); ok {
			week = t
		}
		for _, s := range week {
			s.on = day
			out = append(out, s)
		}
	}
	return out
}

// taper gives the planned sessions of the last three days before an A
// event, and none on the race day: short and easy, as an athlete about to
// load would train (common practice), so the demo's loading plans start
// from a believable week rather than intervals the day before a marathon.
func (a athlete) taper(d int) ([]session, bool) {
	for _, e := range a.events {
		if e.priority != "A" {
			continue
		}
		modality := e.modality
		if modality == "triathlon" {
			modality = "run"
		}
		switch e.inDays - d {
		case 0:
			return nil, true
		case 1:
			return []session{zone(clock("08:00"), modality, 20, "recovery", nil, "easy, with 4 short strides")}, true
		case 2:
			return []session{zone(clock("08:00"), modality, 30, "recovery", nil, "easy")}, true
		case 3:
			return []session{zone(clock("08:00"), modality, 40, "endurance", nil, "easy, a few minutes at race pace")}, true
		}
	}
	return nil, false
}

func clock(s string) *string { return &s }
func km(x float64) *float64  { return &x }

func rpe(start *string, modality string, min int, value float64, dist *float64, notes string) session {
	return session{start: start, modality: modality, min: min, kind: store.IntensityRPE, value: value, km: dist, notes: notes}
}

func zone(start *string, modality string, min int, z string, dist *float64, notes string) session {
	return session{start: start, modality: modality, min: min, kind: store.IntensityZone, zone: z, km: dist, notes: notes}
}

func pct(start *string, modality string, min int, value float64, dist *float64, notes string) session {
	return session{start: start, modality: modality, min: min, kind: store.IntensityPctVO2max, value: value, km: dist, notes: notes}
}
