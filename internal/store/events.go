package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/fuel"
)

// Priorities of events: A is the season's goal, C a training race.
var Priorities = []string{"A", "B", "C"}

// Event is a competition a client is preparing for.
type Event struct {
	ID                  int64
	ClientID            int64
	Name                string
	StartsAt            time.Time // the instant of the start
	TimeZone            string    // IANA zone the event is held in
	Modality            string
	DistanceKm          *float64
	ExpectedDurationMin int // of one day's racing for a multi-day event
	Days                int // 1 for a one-day event; stages for a stage race
	Priority            string
	Notes               string
	CreatedAt           time.Time
	// Segments are a multi-sport event's legs in race order; Stages a
	// stage race's stages. Stored as the engine's JSON.
	Segments []fuel.Segment
	Stages   []fuel.Stage
}

// Event priorities as stored (A, B, C: the codes of periodised training).
const (
	PriorityGoal      = "A"
	PriorityImportant = "B"
	PriorityTraining  = "C"
)

// PriorityLabel names an event priority in words: how much the season is
// built around the race.
func PriorityLabel(p string) string {
	switch p {
	case PriorityGoal:
		return "Goal race"
	case PriorityImportant:
		return "Important race"
	case PriorityTraining:
		return "Training race"
	}
	return p
}

// Location is the event's time zone (UTC if the stored name no longer loads).
func (e Event) Location() *time.Location {
	loc, err := time.LoadLocation(e.TimeZone)
	if err != nil {
		return time.UTC
	}
	return loc
}

// LocalStart is the start in the event's own time zone.
func (e Event) LocalStart() time.Time { return e.StartsAt.In(e.Location()) }

const eventCols = `id, client_id, name, starts_at, time_zone, modality, distance_km::float8, expected_duration_min, days, priority, notes, created_at, segments, stages`

const listEventsSQL = `SELECT ` + eventCols + ` FROM events WHERE client_id = $1 ORDER BY starts_at, id`

func scanEvent(row pgx.Row) (Event, error) {
	var e Event
	err := row.Scan(&e.ID, &e.ClientID, &e.Name, &e.StartsAt, &e.TimeZone, &e.Modality, &e.DistanceKm,
		&e.ExpectedDurationMin, &e.Days, &e.Priority, &e.Notes, &e.CreatedAt, &e.Segments, &e.Stages)
	return e, notFound(err)
}

// ListEvents lists a client's events, soonest first.
func (s *Store) ListEvents(ctx context.Context, clientID int64) ([]Event, error) {
	rows, err := s.Pool.Query(ctx, listEventsSQL, clientID)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (Event, error) { return scanEvent(r) })
}

// EventByID loads one event of a client.
func (s *Store) EventByID(ctx context.Context, clientID, id int64) (Event, error) {
	return scanEvent(s.Pool.QueryRow(ctx, `SELECT `+eventCols+` FROM events WHERE client_id = $1 AND id = $2`, clientID, id))
}

func eventDetail(e *Event) map[string]any {
	return map[string]any{"client_id": e.ClientID, "name": e.Name, "starts_at": e.StartsAt, "time_zone": e.TimeZone,
		"modality": e.Modality, "priority": e.Priority}
}

func defaultDays(e *Event) {
	if e.Days == 0 {
		e.Days = 1
	}
	if e.Segments == nil {
		e.Segments = []fuel.Segment{}
	}
	if e.Stages == nil {
		e.Stages = []fuel.Stage{}
	}
}

// AddEvent records an event; e.ID is filled in.
func (s *Store) AddEvent(ctx context.Context, actor Actor, e *Event) error {
	defaultDays(e)
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `INSERT INTO events (client_id, name, starts_at, time_zone, modality, distance_km,
			expected_duration_min, days, priority, notes, segments, stages) VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12) RETURNING id, created_at`,
			e.ClientID, e.Name, e.StartsAt, e.TimeZone, e.Modality, e.DistanceKm, e.ExpectedDurationMin, e.Days, e.Priority, e.Notes,
			e.Segments, e.Stages).Scan(&e.ID, &e.CreatedAt); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "create", "event", e.ID, eventDetail(e))
	})
}

// UpdateEvent saves a changed event.
func (s *Store) UpdateEvent(ctx context.Context, actor Actor, e *Event) error {
	defaultDays(e)
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE events SET name = $3, starts_at = $4, time_zone = $5, modality = $6, distance_km = $7,
			expected_duration_min = $8, days = $9, priority = $10, notes = $11, segments = $12, stages = $13 WHERE client_id = $1 AND id = $2`,
			e.ClientID, e.ID, e.Name, e.StartsAt, e.TimeZone, e.Modality, e.DistanceKm, e.ExpectedDurationMin, e.Days, e.Priority, e.Notes,
			e.Segments, e.Stages); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "event", e.ID, eventDetail(e))
	})
}

// DeleteEvent removes an event; the audit row keeps what it said.
func (s *Store) DeleteEvent(ctx context.Context, actor Actor, clientID, id int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		e, err := scanEvent(tx.QueryRow(ctx, `DELETE FROM events WHERE client_id = $1 AND id = $2 RETURNING `+eventCols, clientID, id))
		if err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "delete", "event", id, eventDetail(&e))
	})
}
