package store

import (
	"context"
	"fmt"
	"sort"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgtype"

	"larder/internal/mass"
)

// Imports write many rows at once: the rows are copied (COPY) into a
// temporary staging table, and one INSERT … SELECT moves those that are
// neither already recorded nor repeated earlier in the same file. A preview
// runs the same staging in a transaction that is rolled back, so what it
// calls a duplicate is exactly what the import will leave out.
//
// A body-mass row duplicates another of the same client, date and mass (to
// the 0.01 kg kept). A training row duplicates another of the same client
// and start (date and clock time); without a clock time, of the same date,
// activity and duration.

// ImportMass is one body-mass row to import; Line is its line in the file.
type ImportMass struct {
	Line       int
	ClientID   int64
	On         time.Time
	MassKg     float64
	BodyFatPct *float64
	Method     string
	Unit       string
}

// ImportSession is one training row to import.
type ImportSession struct {
	Line           int
	ClientID       int64
	On             time.Time
	Start          string // "HH:MM" or ""
	Modality       string
	DurationMin    int
	IntensityKind  string
	IntensityValue *float64
	IntensityZone  string
	DistanceKm     *float64
	AvgHeartRate   *int
	AvgPowerW      *int
	Status         string
	Notes          string
	Source         string
}

// ImportResult tells what an import did (or, for a preview, would do).
type ImportResult struct {
	Added      int
	Duplicates []int // lines left out as duplicates, in order
}

const stageMass = `CREATE TEMP TABLE stage_body_mass (line int, client_id bigint, measured_on date, mass_kg numeric(6,2),
	body_fat_pct numeric(4,1), method text, entered_unit text) ON COMMIT DROP`

var stageMassCols = []string{"line", "client_id", "measured_on", "mass_kg", "body_fat_pct", "method", "entered_unit"}

const massKey = `client_id, measured_on, mass_kg`

const massExists = `EXISTS (SELECT 1 FROM body_mass b WHERE b.client_id = s.client_id AND b.measured_on = s.measured_on AND b.mass_kg = s.mass_kg)`

func copyMass(ctx context.Context, tx pgx.Tx, rows []ImportMass) error {
	if _, err := tx.Exec(ctx, stageMass); err != nil {
		return err
	}
	_, err := tx.CopyFrom(ctx, pgx.Identifier{"stage_body_mass"}, stageMassCols, pgx.CopyFromSlice(len(rows), func(i int) ([]any, error) {
		r := &rows[i]
		return []any{int32(r.Line), r.ClientID, r.On, r.MassKg, r.BodyFatPct, r.Method, r.Unit}, nil
	}))
	return err
}

// duplicateLines lists the staged lines that repeat a recorded row or an
// earlier line of the file.
func duplicateLines(ctx context.Context, tx pgx.Tx, table, key, exists string) ([]int, error) {
	rows, err := tx.Query(ctx, `SELECT line FROM (SELECT s.*, row_number() OVER (PARTITION BY `+key+` ORDER BY line) AS rn FROM `+table+` s) s
		WHERE rn > 1 OR `+exists+` ORDER BY line`)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (int, error) {
		var n int32
		err := r.Scan(&n)
		return int(n), err
	})
}

// lockClients serialises imports for the same clients, so two people
// confirming the same file at once cannot both add it.
func lockClients(ctx context.Context, tx pgx.Tx, ids []int64) error {
	sorted := append([]int64(nil), ids...)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i] < sorted[j] })
	_, err := tx.Exec(ctx, `SELECT pg_advisory_xact_lock(hashtext('import'), id::int4) FROM unnest($1::bigint[]) AS id`, sorted)
	return err
}

func clientIDs[T any](rows []T, id func(*T) int64) []int64 {
	seen := map[int64]bool{}
	var ids []int64
	for i := range rows {
		if c := id(&rows[i]); !seen[c] {
			seen[c] = true
			ids = append(ids, c)
		}
	}
	return ids
}

// PreviewBodyMass tells which rows an import would leave out as duplicates;
// nothing is written.
func (s *Store) PreviewBodyMass(ctx context.Context, rows []ImportMass) (ImportResult, error) {
	var res ImportResult
	err := s.rollbackTx(ctx, func(tx pgx.Tx) error {
		if err := copyMass(ctx, tx, rows); err != nil {
			return err
		}
		var err error
		res.Duplicates, err = duplicateLines(ctx, tx, "stage_body_mass", massKey, massExists)
		res.Added = len(rows) - len(res.Duplicates)
		return err
	})
	return res, err
}

// ImportBodyMass adds all rows that are not duplicates in one transaction,
// with one audit row per client naming the file and the count (the audit log
// names the import, not every measurement).
func (s *Store) ImportBodyMass(ctx context.Context, actor Actor, file string, rows []ImportMass) (ImportResult, error) {
	var res ImportResult
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		ids := clientIDs(rows, func(r *ImportMass) int64 { return r.ClientID })
		if err := lockClients(ctx, tx, ids); err != nil {
			return err
		}
		if err := copyMass(ctx, tx, rows); err != nil {
			return err
		}
		var err error
		if res.Duplicates, err = duplicateLines(ctx, tx, "stage_body_mass", massKey, massExists); err != nil {
			return err
		}
		counts, err := insertCounted(ctx, tx, `INSERT INTO body_mass (client_id, measured_on, mass_kg, body_fat_pct, method, entered_unit)
			SELECT client_id, measured_on, mass_kg, body_fat_pct, method, entered_unit
			FROM (SELECT DISTINCT ON (`+massKey+`) * FROM stage_body_mass ORDER BY `+massKey+`, line) s
			WHERE NOT `+massExists+` ORDER BY line RETURNING client_id`)
		if err != nil {
			return err
		}
		return auditImport(ctx, tx, actor, "body_mass", file, counts, &res)
	})
	return res, err
}

// insertCounted runs an INSERT … RETURNING client_id and counts the rows
// added per client.
func insertCounted(ctx context.Context, tx pgx.Tx, sql string) (map[int64]int, error) {
	rows, err := tx.Query(ctx, `WITH ins AS (`+sql+`) SELECT client_id, count(*) FROM ins GROUP BY client_id`)
	if err != nil {
		return nil, err
	}
	counts := map[int64]int{}
	var id, n int64
	_, err = pgx.ForEachRow(rows, []any{&id, &n}, func() error {
		counts[id] = int(n)
		return nil
	})
	return counts, err
}

func auditImport(ctx context.Context, tx pgx.Tx, actor Actor, entity, file string, counts map[int64]int, res *ImportResult) error {
	ids := make([]int64, 0, len(counts))
	for id, n := range counts {
		ids = append(ids, id)
		res.Added += n
	}
	sort.Slice(ids, func(i, j int) bool { return ids[i] < ids[j] })
	for _, id := range ids {
		if err := AuditTx(ctx, tx, actor, "import", entity, 0, map[string]any{"client_id": id, "rows": counts[id], "file": file}); err != nil {
			return err
		}
	}
	return nil
}

const stageTraining = `CREATE TEMP TABLE stage_training (line int, client_id bigint, on_date date, start_time time, modality text,
	duration_min int, intensity_kind text, intensity_value numeric(5,1), intensity_zone text, distance_km numeric(8,3),
	avg_heart_rate smallint, avg_power_w smallint, status text, notes text, source text) ON COMMIT DROP`

var stageTrainingCols = []string{"line", "client_id", "on_date", "start_time", "modality", "duration_min", "intensity_kind",
	"intensity_value", "intensity_zone", "distance_km", "avg_heart_rate", "avg_power_w", "status", "notes", "source"}

// The key of a session: its start when known; otherwise date, activity and
// duration (start_time is NULL then, so the two kinds never mix).
const trainingKey = `client_id, on_date, start_time, CASE WHEN start_time IS NULL THEN modality END, CASE WHEN start_time IS NULL THEN duration_min END`

const trainingExists = `EXISTS (SELECT 1 FROM training_sessions t WHERE t.client_id = s.client_id AND t.on_date = s.on_date AND (
	(s.start_time IS NOT NULL AND t.start_time = s.start_time) OR
	(s.start_time IS NULL AND t.start_time IS NULL AND t.modality = s.modality AND t.duration_min = s.duration_min)))`

func optInt16(p *int) any {
	if p == nil {
		return nil
	}
	return int16(*p)
}

func copyTraining(ctx context.Context, tx pgx.Tx, rows []ImportSession) error {
	if _, err := tx.Exec(ctx, stageTraining); err != nil {
		return err
	}
	_, err := tx.CopyFrom(ctx, pgx.Identifier{"stage_training"}, stageTrainingCols, pgx.CopyFromSlice(len(rows), func(i int) ([]any, error) {
		r := &rows[i]
		var start, zone any
		if r.Start != "" {
			t, err := time.Parse("15:04", r.Start)
			if err != nil {
				return nil, fmt.Errorf("line %d: start %q: %w", r.Line, r.Start, err)
			}
			start = pgTime(t)
		}
		if r.IntensityKind == IntensityZone {
			zone = r.IntensityZone
		}
		return []any{int32(r.Line), r.ClientID, r.On, start, r.Modality, int32(r.DurationMin), r.IntensityKind, r.IntensityValue,
			zone, r.DistanceKm, optInt16(r.AvgHeartRate), optInt16(r.AvgPowerW), r.Status, r.Notes, truncate(r.Source, 255)}, nil
	}))
	return err
}

func truncate(s string, n int) string {
	if len([]rune(s)) <= n {
		return s
	}
	return string([]rune(s)[:n])
}

// PreviewTraining tells which sessions an import would leave out as duplicates.
func (s *Store) PreviewTraining(ctx context.Context, rows []ImportSession) (ImportResult, error) {
	var res ImportResult
	err := s.rollbackTx(ctx, func(tx pgx.Tx) error {
		if err := copyTraining(ctx, tx, rows); err != nil {
			return err
		}
		var err error
		res.Duplicates, err = duplicateLines(ctx, tx, "stage_training", trainingKey, trainingExists)
		res.Added = len(rows) - len(res.Duplicates)
		return err
	})
	return res, err
}

// ImportTraining adds all sessions that are not duplicates in one transaction.
func (s *Store) ImportTraining(ctx context.Context, actor Actor, file string, rows []ImportSession) (ImportResult, error) {
	var res ImportResult
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		if err := lockClients(ctx, tx, clientIDs(rows, func(r *ImportSession) int64 { return r.ClientID })); err != nil {
			return err
		}
		if err := copyTraining(ctx, tx, rows); err != nil {
			return err
		}
		var err error
		if res.Duplicates, err = duplicateLines(ctx, tx, "stage_training", trainingKey, trainingExists); err != nil {
			return err
		}
		counts, err := insertCounted(ctx, tx, `INSERT INTO training_sessions (client_id, on_date, start_time, modality, duration_min,
			intensity_kind, intensity_value, intensity_zone, distance_km, avg_heart_rate, avg_power_w, status, notes, source)
			SELECT client_id, on_date, start_time, modality, duration_min, intensity_kind, intensity_value, intensity_zone,
				distance_km, avg_heart_rate, avg_power_w, status, notes, source
			FROM (SELECT DISTINCT ON (`+trainingKey+`) * FROM stage_training ORDER BY `+trainingKey+`, line) s
			WHERE NOT `+trainingExists+` ORDER BY line RETURNING client_id`)
		if err != nil {
			return err
		}
		return auditImport(ctx, tx, actor, "training", file, counts, &res)
	})
	return res, err
}

// rollbackTx runs fn in a transaction that is always rolled back.
func (s *Store) rollbackTx(ctx context.Context, fn func(pgx.Tx) error) error {
	tx, err := s.Pool.Begin(ctx)
	if err != nil {
		return err
	}
	defer tx.Rollback(ctx) //nolint:errcheck // rolling back is the point
	return fn(tx)
}

// ClientKey is how a practice-wide file names a client.
type ClientKey struct {
	Name string
	DOB  time.Time
}

// ClientMatch is the outcome of matching one ClientKey.
type ClientMatch struct {
	ID    int64 // 0 when none or several match
	Count int   // clients with that name (case and accents ignored) and date of birth
	// Unit is the body-mass unit the one matching client is weighed in (their
	// own choice, else the practice's), so a preview reads in it.
	Unit mass.Unit
}

// MatchClients finds clients by name (ignoring case, surrounding spaces and
// accents) and date of birth, archived ones included.
func (s *Store) MatchClients(ctx context.Context, keys []ClientKey) (map[ClientKey]ClientMatch, error) {
	names := make([]string, len(keys))
	dobs := make([]time.Time, len(keys))
	for i, k := range keys {
		names[i], dobs[i] = strings.TrimSpace(k.Name), k.DOB
	}
	rows, err := s.Pool.Query(ctx, `SELECT k.i, count(c.id), min(c.id),
			min(coalesce(c.mass_unit, (SELECT value FROM settings WHERE key = 'mass_unit'), 'kg'))
		FROM unnest($1::text[], $2::date[]) WITH ORDINALITY AS k(name, dob, i)
		LEFT JOIN clients c ON `+foldSQL("btrim(c.name)")+` = `+foldSQL("k.name")+` AND c.date_of_birth = k.dob
		GROUP BY k.i`, names, dobs)
	if err != nil {
		return nil, err
	}
	out := map[ClientKey]ClientMatch{}
	var i, n int64
	var id *int64
	var unit *string
	_, err = pgx.ForEachRow(rows, []any{&i, &n, &id, &unit}, func() error {
		m := ClientMatch{Count: int(n)}
		if n == 1 && id != nil {
			m.ID = *id
			if unit != nil {
				m.Unit = mass.Or(mass.Unit(*unit), mass.Default)
			}
		}
		out[keys[i-1]] = m
		return nil
	})
	return out, err
}

// pgTime gives a clock time (the date part of t is ignored) as PostgreSQL's time.
func pgTime(t time.Time) pgtype.Time {
	us := int64(t.Hour())*3600e6 + int64(t.Minute())*60e6 + int64(t.Second())*1e6
	return pgtype.Time{Microseconds: us, Valid: true}
}
