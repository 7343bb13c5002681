package store

import (
	"context"
	"slices"
	"strconv"

	"github.com/jackc/pgx/v5"

	"larder/internal/mass"
)

// A client's record as tables for export: text cells with dates in ISO 8601
// and numbers with a decimal point, ready to write as CSV. The body-mass and
// training tables use the column names the import reads, so an exported
// file imports again unchanged.
//
// Every column holding a quantity names its unit in its header. A body mass
// is given in kg, as stored and to the stored 0.01 kg, in "body mass (kg)"
// whatever the client's unit: one exact column a program can rely on, and
// the one the import reads back. For a client weighed in pounds a second
// column, "body mass (lb, from kg)", gives the same mass to 0.1 lb as the
// app shows it to them; the import leaves it out, since it only repeats the
// kg column. An event's priority is written in words ("Goal race"), as
// everywhere else in the app, not as its stored code.

// ExportTable is one table of a client's record.
type ExportTable struct {
	Name   string // file name without .csv, e.g. "body-mass"
	Header []string
	Rows   [][]string
}

// ExportTables names the tables ExportClient can give, in zip order.
var ExportTables = []string{"body-mass", "training", "events", "plan-days"}

var exportQueries = map[string]struct {
	header []string
	sql    string
}{
	"body-mass": {[]string{"date", "body mass (kg)", "body fat %", "method", "entered unit"},
		`SELECT measured_on::text, mass_kg::text, coalesce(body_fat_pct::text, ''), method, entered_unit
		FROM body_mass WHERE client_id = $1 ORDER BY measured_on, id`},
	"training": {[]string{"date", "start time", "activity", "duration (min)", "distance (km)", "rpe", "zone", "% vo2max",
		"avg heart rate", "avg power", "status", "notes", "source"},
		`SELECT on_date::text, coalesce(to_char(start_time, 'HH24:MI'), ''), modality, duration_min::text, coalesce(distance_km::text, ''),
			CASE WHEN intensity_kind = 'rpe' THEN intensity_value::text ELSE '' END, coalesce(intensity_zone, ''),
			CASE WHEN intensity_kind = 'pct_vo2max' THEN intensity_value::text ELSE '' END,
			coalesce(avg_heart_rate::text, ''), coalesce(avg_power_w::text, ''), status, notes, source
		FROM training_sessions WHERE client_id = $1 ORDER BY on_date, start_time NULLS FIRST, id`},
	"events": {[]string{"name", "start (local)", "time zone", "start (UTC)", "activity", "distance (km)", "expected duration (min)", "days", "priority", "notes"},
		`SELECT name, to_char(starts_at AT TIME ZONE time_zone, 'YYYY-MM-DD"T"HH24:MI'), time_zone,
			to_char(starts_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI"Z"'), modality, coalesce(distance_km::text, ''),
			expected_duration_min::text, days::text, priority, notes
		FROM events WHERE client_id = $1 ORDER BY starts_at, id`},
	"plan-days": {[]string{"plan", "kind", "version", "status", "date", "role", "load band", "training (min)", "carbohydrate (g/kg)",
		"carbohydrate (g)", "protein (g)", "fat (g)", "energy (kcal)", "low fibre", "overridden"},
		`SELECT p.title, p.kind, v.version::text, v.status, d.on_date::text, d.role, d.load_band, d.training_min::text, d.cho_g_per_kg::text,
			d.cho_g::text, d.protein_g::text, d.fat_g::text, d.energy_kcal::text, d.low_fibre::text, d.overridden::text
		FROM plan_days d JOIN plan_versions v ON v.id = d.plan_version_id JOIN plans p ON p.id = v.plan_id
		WHERE p.client_id = $1 ORDER BY p.created_at, p.id, v.version, d.on_date`},
}

// MassLbHeader is the header of the body-mass export's column in pounds.
const MassLbHeader = "body mass (lb, from kg)"

// ExportClient gives one table of a client's record (see ExportTables);
// unit is the body-mass unit the client is weighed in.
func (s *Store) ExportClient(ctx context.Context, clientID int64, table string, unit mass.Unit) (ExportTable, error) {
	q, ok := exportQueries[table]
	if !ok {
		return ExportTable{}, ErrNotFound
	}
	rows, err := s.Pool.Query(ctx, q.sql, clientID)
	if err != nil {
		return ExportTable{}, err
	}
	out, err := pgx.CollectRows(rows, func(r pgx.CollectableRow) ([]string, error) {
		cells := make([]string, len(q.header))
		dest := make([]any, len(cells))
		for i := range cells {
			dest[i] = &cells[i]
		}
		return cells, r.Scan(dest...)
	})
	if err != nil {
		return ExportTable{}, err
	}
	t := ExportTable{Name: table, Header: q.header, Rows: out}
	switch table {
	case "events":
		for _, row := range t.Rows {
			row[eventsPriorityCol] = PriorityLabel(row[eventsPriorityCol])
		}
	case "body-mass":
		if unit == mass.LB {
			t.addLb()
		}
	}
	return t, nil
}

// Columns of the exported tables that are rewritten after the query.
const (
	eventsPriorityCol = 8
	massKgCol         = 1
)

// addLb puts the pound column after the kg one.
func (t *ExportTable) addLb() {
	t.Header = slices.Insert(slices.Clone(t.Header), massKgCol+1, MassLbHeader)
	for i, row := range t.Rows {
		lb := ""
		if kg, err := strconv.ParseFloat(row[massKgCol], 64); err == nil {
			lb = mass.Input(kg, mass.LB)
		}
		t.Rows[i] = slices.Insert(row, massKgCol+1, lb)
	}
}
