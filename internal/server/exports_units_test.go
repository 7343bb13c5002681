package server

import (
	"context"
	"encoding/csv"
	"net/http"
	"slices"
	"strings"
	"testing"

	"larder/internal/importer"
)

// readExport fetches one CSV of a client's record and parses it strictly
// (RFC 4180: CRLF line ends, quoted fields), after the byte-order mark.
func readExport(t *testing.T, b *browser, clientID int64, file string) (raw string, rows [][]string) {
	t.Helper()
	res := b.get("/clients/" + itoa(clientID) + "/export/" + file)
	if res.status != http.StatusOK {
		t.Fatalf("%s: %d", file, res.status)
	}
	raw, ok := strings.CutPrefix(res.body, "\ufeff")
	if !ok {
		t.Fatalf("%s has no byte-order mark", file)
	}
	if n := strings.Count(raw, "\n"); n == 0 || n != strings.Count(raw, "\r\n") {
		t.Errorf("%s: records do not end in CRLF: %q", file, raw)
	}
	r := csv.NewReader(strings.NewReader(raw))
	rows, err := r.ReadAll()
	if err != nil {
		t.Fatalf("%s does not parse as CSV: %v\n%s", file, err, raw)
	}
	return raw, rows
}

// The body-mass export names its unit in the header: kg always, exact as
// stored, and for a client weighed in pounds a column in lb beside it
// (68.22 kg / 0.45359237 = 150.40 lb; International Yard and Pound
// Agreement, 1959). The file imports back to the same kg. Events give their
// priority in the words the app uses, and a name holding a comma and quotes
// comes back whole.
func TestExportUnitsAndPriorities(t *testing.T) {
	ctx := context.Background()
	a := newApp(t)
	b, _ := a.signedIn("dietitian")
	lb := a.newClient(unique("Export Pounds"))
	kg := a.newClient(unique("Export Kilos"))
	for _, q := range []string{
		`UPDATE clients SET mass_unit = 'lb' WHERE id = $1`,
		`INSERT INTO body_mass (client_id, measured_on, mass_kg, method, entered_unit) VALUES ($1, '2026-03-01', 68.22, 'scale', 'lb')`,
		`INSERT INTO events (client_id, name, starts_at, time_zone, modality, expected_duration_min, priority, notes)
			VALUES ($1, 'Harbour Loop, "the long one"', '2027-04-01 08:00Z', 'UTC', 'run', 200, 'B', 'gels at 40, 80
and 120 min')`,
	} {
		if _, err := a.st.Pool.Exec(ctx, q, lb.ID); err != nil {
			t.Fatal(err)
		}
	}
	if _, err := a.st.Pool.Exec(ctx, `INSERT INTO body_mass (client_id, measured_on, mass_kg) VALUES ($1, '2026-03-01', 70.5)`, kg.ID); err != nil {
		t.Fatal(err)
	}

	raw, rows := readExport(t, b, lb.ID, "body-mass.csv")
	if want := []string{"date", "body mass (kg)", "body mass (lb, from kg)", "body fat %", "method", "entered unit"}; !slices.Equal(rows[0], want) {
		t.Fatalf("header %q, want %q", rows[0], want)
	}
	if len(rows) != 2 || rows[1][1] != "68.22" || rows[1][2] != "150.4" {
		t.Fatalf("rows %q, want 68.22 kg and 150.4 lb", rows)
	}
	sh, err := importer.ReadCSV([]byte("\ufeff"+raw), importer.Options{Kind: importer.KindBodyMass})
	if err != nil || !sh.Ready() || len(sh.Problems) != 0 || len(sh.Mass) != 1 || sh.Mass[0].MassKg != 68.22 {
		t.Fatalf("the lb client's export does not import back to 68.22 kg: %v %+v", err, sh)
	}

	_, rows = readExport(t, b, kg.ID, "body-mass.csv")
	if slices.ContainsFunc(rows[0], func(h string) bool { return strings.Contains(h, "lb") }) || rows[1][1] != "70.50" {
		t.Errorf("kg client's export: %q", rows)
	}

	_, rows = readExport(t, b, lb.ID, "events.csv")
	p := slices.Index(rows[0], "priority")
	if p < 0 || len(rows) != 2 {
		t.Fatalf("events.csv: %q", rows)
	}
	if rows[1][p] != "Important race" {
		t.Errorf("priority %q, want Important race", rows[1][p])
	}
	if rows[1][0] != `Harbour Loop, "the long one"` || rows[1][len(rows[1])-1] != "gels at 40, 80\nand 120 min" {
		t.Errorf("name and notes do not come back whole: %q", rows[1])
	}
}
