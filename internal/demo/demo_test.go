package demo

import (
	"context"
	"os"
	"strings"
	"testing"
	"time"

	"larder/internal/auth"
	"larder/internal/store"
	"larder/internal/testdb"
)

func TestMain(m *testing.M) { os.Exit(testdb.Main(m)) }

func counts(t *testing.T, st *store.Store) map[string]int {
	t.Helper()
	out := map[string]int{}
	for _, table := range []string{"users", "clients", "body_mass", "training_sessions", "events", "audit_log", "settings", "foods"} {
		var n int
		if err := st.Pool.QueryRow(context.Background(), "SELECT count(*) FROM "+table).Scan(&n); err != nil {
			t.Fatal(err)
		}
		out[table] = n
	}
	return out
}

func TestLoadTwiceDuplicatesNothing(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))

	login, err := Load(ctx, st, "")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(login, Email+" / password: ") {
		t.Fatalf("first load should print the generated password, got %q", login)
	}
	generated := strings.TrimPrefix(login, Email+" / password: ")
	u, err := st.UserByEmail(ctx, Email)
	if err != nil {
		t.Fatal(err)
	}
	if ok, _ := auth.CheckPassword(u.PasswordHash, generated); !ok || u.Role != store.RoleAdmin {
		t.Fatalf("demo login: role %q, printed password works: %v", u.Role, ok)
	}
	first := counts(t, st)
	if first["clients"] < 4 || first["clients"] > 5 || first["events"] < 4 || first["body_mass"] < 50 || first["training_sessions"] < 100 {
		t.Fatalf("demo too small: %v", first)
	}

	login, err = Load(ctx, st, "")
	if err != nil {
		t.Fatal(err)
	}
	if login != Email+" (password unchanged; run with --password to set a new one)" {
		t.Fatalf("second load login = %q", login)
	}
	if second := counts(t, st); !equal(first, second) {
		t.Fatalf("second load changed counts:\nfirst  %v\nsecond %v", first, second)
	}

	// --password resets the login's password without adding rows.
	res, err := Run(ctx, st, "a chosen demo password")
	if err != nil {
		t.Fatal(err)
	}
	u, _ = st.UserByEmail(ctx, Email)
	if ok, _ := auth.CheckPassword(u.PasswordHash, "a chosen demo password"); !ok || res.Inserted != 0 {
		t.Fatalf("password not set (ok=%v) or rows inserted (%d)", ok, res.Inserted)
	}
	if name, _ := st.Setting(ctx, store.SettingPracticeName, ""); name != PracticeName {
		t.Fatalf("practice name = %q", name)
	}
}

func equal(a, b map[string]int) bool {
	for k, v := range a {
		if k == "audit_log" {
			continue // a password reset is audited; checked separately
		}
		if b[k] != v {
			return false
		}
	}
	return true
}

func TestDemoContents(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	res, err := Run(ctx, st, "another demo password")
	if err != nil {
		t.Fatal(err)
	}
	today := dateOf(time.Now())

	// The marathoner is a woman with a marathon 4-8 weeks out.
	m, err := st.ClientByID(ctx, res.IDs.Clients["marathoner"])
	if err != nil || m.Sex != store.SexFemale {
		t.Fatalf("marathoner: %+v %v", m, err)
	}
	ev, err := st.EventByID(ctx, m.ID, res.IDs.Events["marathon"])
	if err != nil {
		t.Fatal(err)
	}
	weeks := ev.StartsAt.Sub(today).Hours() / 24 / 7
	if weeks < 4 || weeks > 8 || ev.DistanceKm == nil || *ev.DistanceKm != 42.195 {
		t.Fatalf("marathon %.1f weeks out, distance %v", weeks, ev.DistanceKm)
	}
	if got := ev.LocalStart().Format("15:04"); got != "09:00" {
		t.Fatalf("marathon starts %s local time, want 09:00", got)
	}

	// The days before her marathon are a taper: nothing longer than 40 min
	// in the last three days (common practice before loading), no training
	// on race day.
	var longest, raceDay int
	if err := st.Pool.QueryRow(ctx, `SELECT coalesce(max(duration_min), 0), count(*) FILTER (WHERE on_date = $2::date)
		FROM training_sessions WHERE client_id = $1 AND on_date BETWEEN $2::date - 3 AND $2::date`,
		m.ID, ev.LocalStart().Format(time.DateOnly)).Scan(&longest, &raceDay); err != nil {
		t.Fatal(err)
	}
	if longest > 40 || raceDay != 0 {
		t.Fatalf("taper: longest session %d min in the last 3 days, %d sessions on race day", longest, raceDay)
	}

	// The cyclist is a man with a multi-day stage event.
	c, _ := st.ClientByID(ctx, res.IDs.Clients["cyclist"])
	stage, err := st.EventByID(ctx, c.ID, res.IDs.Events["stage-race"])
	if c.Sex != store.SexMale || err != nil || stage.Days < 2 || stage.Modality != "cycle" {
		t.Fatalf("cyclist %+v stage %+v %v", c, stage, err)
	}

	// The rower trains twice on some days.
	var twice int
	if err := st.Pool.QueryRow(ctx, `SELECT count(*) FROM (SELECT on_date FROM training_sessions WHERE client_id = $1
		GROUP BY on_date HAVING count(*) >= 2) d`, res.IDs.Clients["rower"]).Scan(&twice); err != nil || twice < 20 {
		t.Fatalf("rower double days = %d, %v", twice, err)
	}

	// The practice's own sports foods are there, marked as entered from the
	// label, and each one's energy agrees with its macronutrients by the
	// Atwater general factors (FAO 2003 food energy report): 4, 4, 9 kcal/g.
	var drinks, portable int
	rows, err := st.Pool.Query(ctx, `SELECT name, carbohydrate_g::float8, protein_g::float8, fat_g::float8, energy_kcal::float8, liquid, portable
		FROM foods WHERE source = 'label'`)
	if err != nil {
		t.Fatal(err)
	}
	for rows.Next() {
		var name string
		var cho, prot, fat, kcal float64
		var liquid, port bool
		if err := rows.Scan(&name, &cho, &prot, &fat, &kcal, &liquid, &port); err != nil {
			t.Fatal(err)
		}
		if atwater := 4*cho + 4*prot + 9*fat; kcal < atwater-3 || kcal > atwater+3 {
			t.Errorf("%s: %g kcal/100 g, Atwater sum %g", name, kcal, atwater)
		}
		if liquid {
			drinks++
		}
		if port {
			portable++
		}
	}
	if drinks == 0 || portable < 3 {
		t.Errorf("practice foods: %d drinks, %d portable; in-event feeds need both", drinks, portable)
	}

	// One client has coeliac disease on record, so a demo plan for him shows
	// gluten-free food suggestions.
	runner, _ := st.ClientByID(ctx, res.IDs.Clients["trail"])
	if !strings.Contains(strings.ToLower(runner.Cautions), "coeliac") {
		t.Fatalf("trail runner cautions = %q", runner.Cautions)
	}

	// One client has a recorded diabetes caution.
	tri, _ := st.ClientByID(ctx, res.IDs.Clients["triathlete"])
	if !strings.Contains(strings.ToLower(tri.Cautions), "type 1 diabetes") {
		t.Fatalf("triathlete cautions = %q", tri.Cautions)
	}

	// Past sessions are done, future ones planned; history reaches weeks back.
	var past, future, badStatus int
	if err := st.Pool.QueryRow(ctx, `SELECT count(*) FILTER (WHERE on_date <= $1), count(*) FILTER (WHERE on_date > $1),
		count(*) FILTER (WHERE (on_date <= $1) <> (status = 'done')) FROM training_sessions`, today).Scan(&past, &future, &badStatus); err != nil {
		t.Fatal(err)
	}
	if past == 0 || future == 0 || badStatus != 0 {
		t.Fatalf("past %d, future %d, wrong status %d", past, future, badStatus)
	}
	hist, _ := st.ListBodyMass(ctx, m.ID)
	if len(hist) < 10 || hist[len(hist)-1].MeasuredOn.After(today.AddDate(0, 0, -42)) {
		t.Fatalf("body-mass history too short: %d rows", len(hist))
	}
	// The pound-entering client keeps his unit.
	trail, _ := st.ListBodyMass(ctx, res.IDs.Clients["trail"])
	if len(trail) == 0 || trail[0].EnteredUnit != "lb" {
		t.Fatalf("trail runner entered unit: %+v", trail)
	}
}
