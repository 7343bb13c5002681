package server

import (
	"archive/zip"
	"bytes"
	"context"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"larder/internal/importer"
)

// The record zip opens, holds the four CSV files and a sheet per published
// plan, and its body-mass and training files read back (through the import
// reader) to exactly the recorded rows.
func TestExportRecordZip(t *testing.T) {
	a := newApp(t)
	res := loadDemo(t, a)
	id := res.IDs.Clients["marathoner"]
	b, _ := a.signedIn("dietitian")
	before := a.count(`SELECT count(*) FROM audit_log WHERE action = 'export' AND entity = 'client' AND entity_id = $1`, id)
	got := b.get("/clients/" + itoa(id) + "/export/record.zip")
	if got.status != http.StatusOK {
		t.Fatalf("zip: %d %s", got.status, got.body)
	}
	zr, err := zip.NewReader(bytes.NewReader([]byte(got.body)), int64(len(got.body)))
	if err != nil {
		t.Fatalf("zip does not open: %v", err)
	}
	files := map[string][]byte{}
	pdfs := 0
	for _, f := range zr.File {
		rc, err := f.Open()
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		buf.ReadFrom(rc)
		rc.Close()
		files[f.Name] = buf.Bytes()
		if strings.HasPrefix(f.Name, "plan-sheets/") && bytes.HasPrefix(buf.Bytes(), []byte("%PDF")) {
			pdfs++
		}
	}
	for _, n := range []string{"body-mass.csv", "training.csv", "events.csv", "plan-days.csv"} {
		if _, ok := files[n]; !ok {
			t.Errorf("zip lacks %s", n)
		}
	}
	published := a.count(`SELECT count(*) FROM plans p JOIN plan_versions v ON v.plan_id = p.id AND v.status = 'published' WHERE p.client_id = $1`, id)
	if published == 0 || pdfs != published {
		t.Errorf("%d plan sheets in the zip, %d published plans", pdfs, published)
	}
	mass, err := importer.ReadCSV(files["body-mass.csv"], importer.Options{Kind: importer.KindBodyMass})
	if err != nil || !mass.Ready() || len(mass.Problems) != 0 {
		t.Fatalf("body-mass.csv does not read back: %v %+v", err, mass)
	}
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, id); n == 0 || len(mass.Mass) != n {
		t.Fatalf("body-mass.csv has %d rows, the record %d", len(mass.Mass), n)
	}
	for _, m := range mass.Mass {
		if a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1 AND measured_on = $2 AND mass_kg = $3`, id, m.On, m.MassKg) != 1 {
			t.Errorf("exported %s %.2f kg is not in the record", m.On.Format("2006-01-02"), m.MassKg)
		}
	}
	tr, err := importer.ReadCSV(files["training.csv"], importer.Options{Kind: importer.KindTraining})
	if err != nil || !tr.Ready() || len(tr.Problems) != 0 {
		t.Fatalf("training.csv does not read back: %v %+v", err, tr.Problems)
	}
	if n := a.count(`SELECT count(*) FROM training_sessions WHERE client_id = $1`, id); n == 0 || len(tr.Sessions) != n {
		t.Fatalf("training.csv has %d rows, the record %d", len(tr.Sessions), n)
	}
	for _, s := range tr.Sessions {
		if a.count(`SELECT count(*) FROM training_sessions WHERE client_id = $1 AND on_date = $2 AND modality = $3 AND duration_min = $4
			AND coalesce(intensity_zone, '') = $5`, id, s.On, s.Modality, s.DurationMin, s.IntensityZone) == 0 {
			t.Errorf("exported session %+v is not in the record", s)
		}
	}
	if !strings.HasPrefix(string(files["events.csv"]), "\ufeffname,start (local)") {
		t.Errorf("events.csv starts %q", string(files["events.csv"][:40]))
	}
	if after := a.count(`SELECT count(*) FROM audit_log WHERE action = 'export' AND entity = 'client' AND entity_id = $1`, id); after != before+1 {
		t.Errorf("export audit rows %d → %d", before, after)
	}
	if got := b.get("/clients/" + itoa(id) + "/export/secrets.csv"); got.status != http.StatusNotFound {
		t.Errorf("unknown export: %d", got.status)
	}
}

// Erasure: only an admin, only after typing the name; then no row of the
// client is left anywhere, and the audit log keeps a tombstone without
// health data.
func TestEraseClient(t *testing.T) {
	ctx := context.Background()
	a := newApp(t)
	res := loadDemo(t, a)
	src := res.IDs.Clients["marathoner"]
	c := a.newClient(unique("Erase Me"))
	_, err := a.st.Pool.Exec(ctx, `
		INSERT INTO body_mass (client_id, measured_on, mass_kg) SELECT $1, measured_on, mass_kg FROM body_mass WHERE client_id = $2;
		`, c.ID, src)
	if err != nil {
		t.Fatal(err)
	}
	// Give the client a copy of the demo client's plans, with versions, days
	// and feeds, plus training, an event and a link.
	for _, sql := range []string{
		`INSERT INTO training_sessions (client_id, on_date, modality, duration_min, intensity_kind, intensity_value) VALUES ($1, '2027-02-01', 'run', 40, 'rpe', 5)`,
		`INSERT INTO events (client_id, name, starts_at, time_zone, modality, expected_duration_min, priority) VALUES ($1, 'Erase race', '2027-04-01 08:00Z', 'UTC', 'run', 200, 'A')`,
		`INSERT INTO client_links (client_id, token_hash, expires_at) VALUES ($1, sha256(random()::text::bytea), now() + interval '1 day')`,
	} {
		if _, err := a.st.Pool.Exec(ctx, sql, c.ID); err != nil {
			t.Fatal(err)
		}
	}
	var planID int64
	if err := a.st.Pool.QueryRow(ctx, `INSERT INTO plans (client_id, kind, protocol, title) SELECT $1, kind, protocol, title FROM plans WHERE client_id = $2
		ORDER BY id LIMIT 1 RETURNING id`, c.ID, src).Scan(&planID); err != nil {
		t.Fatal(err)
	}
	if _, err := a.st.Pool.Exec(ctx, `WITH v AS (INSERT INTO plan_versions (plan_id, version, status, request, result, body_mass_kg, published_at)
		SELECT $1, 1, 'published', request, result, body_mass_kg, now() FROM plan_versions WHERE plan_id = (SELECT id FROM plans WHERE client_id = $2 ORDER BY id LIMIT 1) ORDER BY version LIMIT 1 RETURNING id)
		INSERT INTO plan_days (plan_version_id, on_date, role, load_band, cho_g_per_kg, cho_g, protein_g, fat_g, energy_kcal)
		SELECT v.id, '2027-03-30', 'load', 'high', 10, 600, 100, 50, 3500 FROM v`, planID, src); err != nil {
		t.Fatal(err)
	}
	admin, _ := a.signedIn("admin")
	diet, _ := a.signedIn("dietitian")
	erase := "/clients/" + itoa(c.ID) + "/erase"
	if got := diet.post(erase, url.Values{"confirm_name": {c.Name}}); got.status != http.StatusForbidden {
		t.Fatalf("dietitian erase: %d", got.status)
	}
	got := admin.post(erase, url.Values{"confirm_name": {"someone else"}})
	if got.status != http.StatusUnprocessableEntity || !strings.Contains(got.body, "Nothing was erased") {
		t.Fatalf("wrong name: %d", got.status)
	}
	if a.count(`SELECT count(*) FROM clients WHERE id = $1`, c.ID) != 1 {
		t.Fatal("erased after a wrong name")
	}
	admin.get("/clients/" + itoa(c.ID) + "/export/body-mass.csv") // an export, audited, about to be erased
	admin.post(erase, url.Values{"confirm_name": {"  " + strings.ToUpper(c.Name) + " "}}).mustRedirect(t, "/clients")

	// Every table with a client_id column holds nothing of the client.
	rows, err := a.st.Pool.Query(ctx, `SELECT table_name FROM information_schema.columns WHERE column_name = 'client_id' AND table_schema = 'public'`)
	if err != nil {
		t.Fatal(err)
	}
	var tables []string
	for rows.Next() {
		var n string
		rows.Scan(&n)
		tables = append(tables, n)
	}
	rows.Close()
	if len(tables) < 6 {
		t.Fatalf("only %v have client_id", tables)
	}
	for _, tb := range tables {
		if n := a.count(`SELECT count(*) FROM "`+tb+`" WHERE client_id = $1`, c.ID); n != 0 {
			t.Errorf("%s keeps %d rows of the erased client", tb, n)
		}
	}
	if n := a.count(`SELECT count(*) FROM plan_versions WHERE plan_id = $1`, planID); n != 0 {
		t.Errorf("%d plan versions left", n)
	}
	if n := a.count(`SELECT count(*) FROM plan_days d WHERE NOT EXISTS (SELECT 1 FROM plan_versions v WHERE v.id = d.plan_version_id)`); n != 0 {
		t.Errorf("%d orphan plan days", n)
	}
	// The audit log: one tombstone, nothing else about the client.
	if n := a.count(`SELECT count(*) FROM audit_log WHERE (entity = 'client' AND entity_id = $1 AND action <> 'erase')
		OR detail->>'client_id' = $1::text OR (entity = 'plan' AND entity_id = $2) OR detail::text LIKE '%' || $3 || '%'`, c.ID, planID, c.Name); n != 0 {
		t.Errorf("%d audit rows still describe the erased client", n)
	}
	if n := a.count(`SELECT count(*) FROM audit_log WHERE action = 'erase' AND entity = 'client' AND entity_id = $1 AND user_id IS NOT NULL AND detail = '{}'`, c.ID); n != 1 {
		t.Errorf("%d tombstones", n)
	}
	if got := admin.get("/clients/" + itoa(c.ID)); got.status != http.StatusNotFound {
		t.Errorf("erased client's page: %d", got.status)
	}
	// The demo client the plans were copied from is untouched.
	if a.count(`SELECT count(*) FROM clients WHERE id = $1`, src) != 1 {
		t.Error("the source client went too")
	}
}
