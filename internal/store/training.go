package store

import (
	"context"
	"fmt"
	"time"

	"github.com/jackc/pgx/v5"
)

// Modalities of training sessions and events, named as the fuel engine's
// request names them.
var Modalities = []string{"run", "cycle", "swim", "row", "ski", "triathlon", "team", "strength", "other"}

// ModalityLabel gives a modality's display name.
func ModalityLabel(m string) string {
	switch m {
	case "run":
		return "Running"
	case "cycle":
		return "Cycling"
	case "swim":
		return "Swimming"
	case "row":
		return "Rowing"
	case "ski":
		return "Cross-country skiing"
	case "triathlon":
		return "Triathlon"
	case "team":
		return "Team sport"
	case "strength":
		return "Strength"
	case "other":
		return "Other"
	}
	return m
}

// Intensity kinds of a training session.
const (
	IntensityRPE       = "rpe"        // rating of perceived exertion, 1-10
	IntensityZone      = "zone"       // one of Zones
	IntensityPctVO2max = "pct_vo2max" // percent of maximal oxygen uptake, 20-120
)

// Zones are the named training zones, easiest first.
var Zones = []string{"recovery", "endurance", "tempo", "threshold", "maximal"}

// Session statuses.
const (
	StatusPlanned = "planned"
	StatusDone    = "done"
)

// TrainingSession is one entry of a client's training log.
type TrainingSession struct {
	ID             int64
	ClientID       int64
	OnDate         time.Time // date only
	StartTime      string    // "HH:MM", or "" when not recorded
	Modality       string
	DurationMin    int
	IntensityKind  string
	IntensityValue *float64 // RPE or %VO2max; nil for a zone
	IntensityZone  string   // for IntensityZone
	DistanceKm     *float64
	Status         string
	Notes          string
	// TrainLow marks a session the dietitian keeps deliberately unfuelled.
	TrainLow bool
	// AvgHeartRate (beats/min) and AvgPowerW (W) are the session's recorded
	// means, from a watch or bike computer file or typed; nil when none.
	AvgHeartRate *int
	AvgPowerW    *int
	CreatedAt    time.Time
}

// IntensityText describes the intensity for display ("RPE 7", "tempo zone", "75% VO2max").
func (t TrainingSession) IntensityText() string {
	switch t.IntensityKind {
	case IntensityRPE:
		if t.IntensityValue != nil {
			return fmt.Sprintf("RPE %g", *t.IntensityValue)
		}
	case IntensityPctVO2max:
		if t.IntensityValue != nil {
			return fmt.Sprintf("%g%% VO2max", *t.IntensityValue)
		}
	case IntensityZone:
		return t.IntensityZone + " zone"
	}
	return ""
}

// FuelIntensity names the intensity as the fuel engine's request does
// (easy | moderate | hard | rpe:N | pct:N). Zones map to the three words.
func (t TrainingSession) FuelIntensity() string {
	switch t.IntensityKind {
	case IntensityRPE:
		if t.IntensityValue != nil {
			return fmt.Sprintf("rpe:%g", *t.IntensityValue)
		}
	case IntensityPctVO2max:
		if t.IntensityValue != nil {
			return fmt.Sprintf("pct:%g", *t.IntensityValue)
		}
	case IntensityZone:
		switch t.IntensityZone {
		case "recovery", "endurance":
			return "easy"
		case "tempo":
			return "moderate"
		case "threshold", "maximal":
			return "hard"
		}
	}
	return ""
}

// FuelPowerW is the recorded mean power as the fuel engine's request
// takes it, nil when none was recorded.
func (t TrainingSession) FuelPowerW() *float64 {
	if t.AvgPowerW == nil {
		return nil
	}
	w := float64(*t.AvgPowerW)
	return &w
}

const trainingCols = `id, client_id, on_date, coalesce(to_char(start_time, 'HH24:MI'), ''), modality, duration_min,
	intensity_kind, intensity_value::float8, coalesce(intensity_zone, ''), distance_km::float8, status, notes, created_at, train_low,
	avg_heart_rate, avg_power_w`

func scanTraining(row pgx.Row) (TrainingSession, error) {
	var t TrainingSession
	err := row.Scan(&t.ID, &t.ClientID, &t.OnDate, &t.StartTime, &t.Modality, &t.DurationMin,
		&t.IntensityKind, &t.IntensityValue, &t.IntensityZone, &t.DistanceKm, &t.Status, &t.Notes, &t.CreatedAt, &t.TrainLow,
		&t.AvgHeartRate, &t.AvgPowerW)
	return t, notFound(err)
}

const (
	listTrainingSQL = `SELECT ` + trainingCols + ` FROM training_sessions WHERE client_id = $1
		ORDER BY on_date DESC, start_time DESC NULLS LAST, id DESC`
	trainingBetweenSQL = `SELECT ` + trainingCols + ` FROM training_sessions
		WHERE client_id = $1 AND on_date BETWEEN $2::date AND $3::date
		ORDER BY on_date, start_time NULLS FIRST, id`
	recentTrainingSQL = `SELECT ` + trainingCols + ` FROM training_sessions
		WHERE client_id = $1 AND on_date BETWEEN $2::date AND $3::date
		ORDER BY on_date DESC, start_time DESC NULLS LAST, id DESC`
	countTrainingSQL = `SELECT count(*) FROM training_sessions WHERE client_id = $1`
)

func collectTraining(rows pgx.Rows, err error) ([]TrainingSession, error) {
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (TrainingSession, error) { return scanTraining(r) })
}

// ListTraining lists a client's training log, newest first.
func (s *Store) ListTraining(ctx context.Context, clientID int64) ([]TrainingSession, error) {
	return collectTraining(s.Pool.Query(ctx, listTrainingSQL, clientID))
}

// TrainingBetween lists a client's sessions from one date to another
// (both included), oldest first — the order a plan reads them in.
func (s *Store) TrainingBetween(ctx context.Context, clientID int64, from, to time.Time) ([]TrainingSession, error) {
	return collectTraining(s.Pool.Query(ctx, trainingBetweenSQL, clientID, from.Format(time.DateOnly), to.Format(time.DateOnly)))
}

// TrainingByID loads one session of a client.
func (s *Store) TrainingByID(ctx context.Context, clientID, id int64) (TrainingSession, error) {
	return scanTraining(s.Pool.QueryRow(ctx, `SELECT `+trainingCols+` FROM training_sessions WHERE client_id = $1 AND id = $2`, clientID, id))
}

func trainingArgs(t *TrainingSession) []any {
	var zone *string
	if t.IntensityKind == IntensityZone {
		zone = &t.IntensityZone
	}
	return []any{t.ClientID, t.OnDate, t.StartTime, t.Modality, t.DurationMin, t.IntensityKind, t.IntensityValue, zone, t.DistanceKm, t.Status, t.Notes, t.TrainLow, t.AvgHeartRate, t.AvgPowerW}
}

func trainingDetail(t *TrainingSession) map[string]any {
	return map[string]any{"client_id": t.ClientID, "on_date": t.OnDate.Format(time.DateOnly), "start_time": t.StartTime,
		"modality": t.Modality, "duration_min": t.DurationMin, "intensity": t.IntensityText(), "status": t.Status, "train_low": t.TrainLow}
}

// AddTraining records a session; t.ID is filled in.
func (s *Store) AddTraining(ctx context.Context, actor Actor, t *TrainingSession) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `INSERT INTO training_sessions (client_id, on_date, start_time, modality, duration_min,
			intensity_kind, intensity_value, intensity_zone, distance_km, status, notes, train_low, avg_heart_rate, avg_power_w)
			VALUES ($1, $2, NULLIF($3, '')::time, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14) RETURNING id, created_at`,
			trainingArgs(t)...).Scan(&t.ID, &t.CreatedAt); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "create", "training", t.ID, trainingDetail(t))
	})
}

// UpdateTraining saves a corrected session.
func (s *Store) UpdateTraining(ctx context.Context, actor Actor, t *TrainingSession) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		args := append(trainingArgs(t), t.ID)
		if err := execOne(ctx, tx, `UPDATE training_sessions SET on_date = $2, start_time = NULLIF($3, '')::time, modality = $4,
			duration_min = $5, intensity_kind = $6, intensity_value = $7, intensity_zone = $8, distance_km = $9, status = $10, notes = $11, train_low = $12,
			avg_heart_rate = $13, avg_power_w = $14
			WHERE client_id = $1 AND id = $15`, args...); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "training", t.ID, trainingDetail(t))
	})
}

// DeleteTraining removes a session; the audit row keeps what it said.
func (s *Store) DeleteTraining(ctx context.Context, actor Actor, clientID, id int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		t, err := scanTraining(tx.QueryRow(ctx, `DELETE FROM training_sessions WHERE client_id = $1 AND id = $2 RETURNING `+trainingCols, clientID, id))
		if err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "delete", "training", id, trainingDetail(&t))
	})
}
