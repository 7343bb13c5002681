package store_test

import (
	"context"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"

	"larder/internal/importer"
	"larder/internal/store"
	"larder/internal/testdb"
)

func importClient(t testing.TB, st *store.Store, name string) store.Client {
	t.Helper()
	dob := time.Date(1995, 4, 3, 0, 0, 0, 0, time.UTC)
	c := store.Client{Name: name, Sex: store.SexFemale, DateOfBirth: &dob}
	if err := st.CreateClient(context.Background(), store.System, &c); err != nil {
		t.Fatal(err)
	}
	return c
}

// readMass reads a CSV and imports its good rows for the client, as the
// import page does after confirmation.
func readMass(t *testing.T, st *store.Store, clientID int64, csv string, opt importer.Options) (*importer.Sheet, store.ImportResult) {
	t.Helper()
	opt.Kind = importer.KindBodyMass
	sh, err := importer.ReadCSV([]byte(csv), opt)
	if err != nil {
		t.Fatalf("ReadCSV: %v", err)
	}
	rows := make([]store.ImportMass, len(sh.Mass))
	for i, m := range sh.Mass {
		rows[i] = m.ForStore(clientID)
	}
	res, err := st.ImportBodyMass(context.Background(), store.System, "test.csv", rows)
	if err != nil {
		t.Fatalf("ImportBodyMass: %v", err)
	}
	return sh, res
}

type savedMass struct {
	on   string
	kg   float64
	unit string
}

func savedMasses(t *testing.T, st *store.Store, clientID int64) []savedMass {
	t.Helper()
	rows, err := st.Pool.Query(context.Background(), `SELECT measured_on::text, mass_kg::float8, entered_unit FROM body_mass WHERE client_id = $1 ORDER BY measured_on, mass_kg`, clientID)
	if err != nil {
		t.Fatal(err)
	}
	defer rows.Close()
	var out []savedMass
	for rows.Next() {
		var m savedMass
		if err := rows.Scan(&m.on, &m.kg, &m.unit); err != nil {
			t.Fatal(err)
		}
		out = append(out, m)
	}
	return out
}

// Every delimiter, unit, date format and header variant, through to the
// rows PostgreSQL keeps. 1 lb = 0.45359237 kg (International Yard and Pound
// Agreement, 1959): 154.3 lb = 69.99 kg.
func TestImportBodyMassVariants(t *testing.T) {
	st := store.New(testdb.Pool(t))
	for _, tc := range []struct {
		name string
		csv  string
		opt  importer.Options
		want []savedMass
	}{
		{"comma ISO kg", "date,mass\n2026-03-01,70.5\n2026-03-02,70.1\n", importer.Options{},
			[]savedMass{{"2026-03-01", 70.5, "kg"}, {"2026-03-02", 70.1, "kg"}}},
		{"semicolon decimal comma d/m/y", "Datum;Body mass\n01/03/2026;70,5\n31/03/2026;70,1\n", importer.Options{Mapping: map[string]string{"datum": importer.FieldDate}},
			[]savedMass{{"2026-03-01", 70.5, "kg"}, {"2026-03-31", 70.1, "kg"}}},
		{"tab m/d/y lb header", "Weight (lb)\tDate\n154.3\t03/31/2026\n", importer.Options{},
			[]savedMass{{"2026-03-31", 69.99, "lb"}}},
		{"ambiguous answered m/d/y", "date,mass\n03/04/2026,70\n", importer.Options{DateOrder: importer.OrderMDY},
			[]savedMass{{"2026-03-04", 70, "kg"}}},
		{"ambiguous answered d/m/y", "date,mass\n03/04/2026,70\n", importer.Options{DateOrder: importer.OrderDMY},
			[]savedMass{{"2026-04-03", 70, "kg"}}},
		{"unit column mixed", "date,mass,unit\n2026-03-01,154.3,lb\n2026-03-02,70,kg\n", importer.Options{},
			[]savedMass{{"2026-03-01", 69.99, "lb"}, {"2026-03-02", 70, "kg"}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := importClient(t, st, uniq("Variant "+tc.name))
			sh, res := readMass(t, st, c.ID, tc.csv, tc.opt)
			if len(sh.Problems) != 0 || res.Added != len(tc.want) {
				t.Fatalf("problems %v, added %d", sh.Problems, res.Added)
			}
			got := savedMasses(t, st, c.ID)
			if len(got) != len(tc.want) {
				t.Fatalf("saved %v, want %v", got, tc.want)
			}
			for i, w := range tc.want {
				if got[i].on != w.on || math.Abs(got[i].kg-w.kg) > 0.001 || got[i].unit != w.unit {
					t.Errorf("row %d saved %+v, want %+v", i, got[i], w)
				}
			}
		})
	}
}

func TestImportBodyMassDuplicatesAndReimport(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := importClient(t, st, uniq("Dup"))
	m := store.BodyMass{ClientID: c.ID, MeasuredOn: time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC), MassKg: 70, EnteredUnit: "kg"}
	if err := st.AddBodyMass(ctx, store.System, &m); err != nil {
		t.Fatal(err)
	}
	csv := "date,mass\n2026-03-01,70\n2026-03-02,70.2\n2026-03-02,70.2\n2026-03-02,70.4\nbad,70\n"
	sh, err := importer.ReadCSV([]byte(csv), importer.Options{Kind: importer.KindBodyMass})
	if err != nil {
		t.Fatal(err)
	}
	rows := make([]store.ImportMass, len(sh.Mass))
	for i, r := range sh.Mass {
		rows[i] = r.ForStore(c.ID)
	}
	pre, err := st.PreviewBodyMass(ctx, rows)
	if err != nil {
		t.Fatal(err)
	}
	// Line 2 repeats the recorded 1 March; line 4 repeats line 3.
	if pre.Added != 2 || fmt.Sprint(pre.Duplicates) != "[2 4]" {
		t.Fatalf("preview %+v", pre)
	}
	if n := len(savedMasses(t, st, c.ID)); n != 1 {
		t.Fatalf("preview wrote rows: %d saved", n)
	}
	res, err := st.ImportBodyMass(ctx, store.System, "dup.csv", rows)
	if err != nil || res.Added != 2 || fmt.Sprint(res.Duplicates) != "[2 4]" {
		t.Fatalf("import %+v %v", res, err)
	}
	again, err := st.ImportBodyMass(ctx, store.System, "dup.csv", rows)
	if err != nil || again.Added != 0 || len(again.Duplicates) != 4 {
		t.Fatalf("re-import %+v %v", again, err)
	}
	if n := len(savedMasses(t, st, c.ID)); n != 3 {
		t.Fatalf("%d rows saved, want 3", n)
	}
	var audits int
	st.Pool.QueryRow(ctx, `SELECT count(*) FROM audit_log WHERE action = 'import' AND (detail->>'client_id')::bigint = $1`, c.ID).Scan(&audits)
	if audits != 1 {
		t.Errorf("%d import audit rows, want 1 (the re-import added nothing)", audits)
	}
}

// One row PostgreSQL refuses makes the whole import write nothing.
func TestImportAllOrNothing(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := importClient(t, st, uniq("AllOrNothing"))
	day := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	rows := []store.ImportMass{
		{Line: 2, ClientID: c.ID, On: day, MassKg: 70, Unit: "kg"},
		{Line: 3, ClientID: c.ID, On: day.AddDate(0, 0, 1), MassKg: 5, Unit: "kg"}, // below the table's 20 kg
	}
	if _, err := st.ImportBodyMass(ctx, store.System, "x.csv", rows); err == nil {
		t.Fatal("import of a 5 kg row succeeded")
	}
	if n := len(savedMasses(t, st, c.ID)); n != 0 {
		t.Fatalf("%d rows kept after a failed import", n)
	}
}

func TestImportTraining(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := importClient(t, st, uniq("Training"))
	csv := "date,start,activity,duration,distance,rpe,avg hr,avg power\n" +
		"2026-03-01,07:30,run,45,10,6,150,\n" +
		"2026-03-01,07:30,run,50,10,6,150,\n" + // same start as line 2: duplicate
		"2026-03-02,,bike,1:30:00,40,,,215\n" +
		"2026-03-02,,bike,1:30:00,40,,,215\n" + // same day, activity, duration, no start: duplicate
		"2026-03-02,,run,30,,,,\n" // same day, other activity: kept
	sh, err := importer.ReadCSV([]byte(csv), importer.Options{Kind: importer.KindTraining, DefaultZone: "endurance"})
	if err != nil || len(sh.Problems) != 0 {
		t.Fatal(err, sh.Problems)
	}
	rows := make([]store.ImportSession, len(sh.Sessions))
	for i, r := range sh.Sessions {
		rows[i] = r.ForStore(c.ID)
	}
	res, err := st.ImportTraining(ctx, store.System, "t.csv", rows)
	if err != nil || res.Added != 3 || fmt.Sprint(res.Duplicates) != "[3 5]" {
		t.Fatalf("import %+v %v", res, err)
	}
	again, err := st.ImportTraining(ctx, store.System, "t.csv", rows)
	if err != nil || again.Added != 0 {
		t.Fatalf("re-import %+v %v", again, err)
	}
	var power, hr int
	var zone, start string
	if err := st.Pool.QueryRow(ctx, `SELECT coalesce(avg_power_w, 0), coalesce(avg_heart_rate, 0), coalesce(intensity_zone, ''), coalesce(start_time::text, '')
		FROM training_sessions WHERE client_id = $1 AND modality = 'cycle'`, c.ID).Scan(&power, &hr, &zone, &start); err != nil {
		t.Fatal(err)
	}
	if power != 215 || hr != 0 || zone != "endurance" || start != "" {
		t.Errorf("cycle row: power %d hr %d zone %q start %q", power, hr, zone, start)
	}
	ts, err := st.ListTraining(ctx, c.ID)
	if err != nil || len(ts) != 3 {
		t.Fatalf("ListTraining: %v %d", err, len(ts))
	}
}

func TestMatchClients(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	name := uniq("Tomás Match")
	c := importClient(t, st, name)
	dob := *c.DateOfBirth
	twin := uniq("Twin")
	importClient(t, st, twin)
	importClient(t, st, twin)
	keys := []store.ClientKey{
		{Name: "  " + strings.ToUpper(strings.Replace(name, "á", "a", 1)) + " ", DOB: dob},
		{Name: name, DOB: dob.AddDate(0, 0, 1)},
		{Name: twin, DOB: dob},
	}
	got, err := st.MatchClients(ctx, keys)
	if err != nil {
		t.Fatal(err)
	}
	if m := got[keys[0]]; m.ID != c.ID || m.Count != 1 {
		t.Errorf("accent and case folded match: %+v", m)
	}
	if m := got[keys[1]]; m.ID != 0 || m.Count != 0 {
		t.Errorf("other birth date: %+v", m)
	}
	if m := got[keys[2]]; m.ID != 0 || m.Count != 2 {
		t.Errorf("two clients of one name and birth date: %+v", m)
	}
}
