package store

import (
	"context"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/mass"
)

// Sexes as used by physiology equations.
const (
	SexFemale = "female"
	SexMale   = "male"
)

// Client is an athlete the practice works with.
type Client struct {
	ID          int64
	Name        string
	DateOfBirth *time.Time // date only
	Sex         string     // female | male, for physiology equations
	HeightCm    *float64
	Sport       string
	Notes       string
	Cautions    string // recorded cautions (e.g. type 1 diabetes), shown prominently; never to the athlete
	// SharedNote is the health note the dietitian chose to share with the
	// athlete, in plain words: the only one the athlete's surfaces show.
	SharedNote string
	// AthleteSeesEnergyMass shows energy and body-mass figures (kcal, g/kg,
	// kg) on the athlete's surfaces; off by default.
	AthleteSeesEnergyMass bool
	// MassUnit is the client's own choice of body-mass unit, "" to follow
	// the practice's; Unit is the one in effect, read with the client.
	MassUnit   mass.Unit
	Unit       mass.Unit
	ArchivedAt *time.Time
	CreatedAt  time.Time
	UpdatedAt  time.Time
}

// Archived reports whether the client is archived.
func (c Client) Archived() bool { return c.ArchivedAt != nil }

// AgeOn gives the client's age in whole years on a date, or -1 when the date
// of birth is not recorded.
func (c Client) AgeOn(day time.Time) int {
	if c.DateOfBirth == nil {
		return -1
	}
	b := *c.DateOfBirth
	age := day.Year() - b.Year()
	if day.Month() < b.Month() || (day.Month() == b.Month() && day.Day() < b.Day()) {
		age--
	}
	return age
}

// ClientRow is a client as listed, with the latest body mass and next event.
type ClientRow struct {
	Client
	LatestMassKg   *float64
	LatestMassOn   *time.Time
	NextEventName  string
	NextEventStart *time.Time
	NextEventZone  string
}

// Which clients a list shows.
const (
	ShowActive   = "active"
	ShowArchived = "archived"
	ShowAll      = "all"
)

// ClientFilter narrows the client list.
type ClientFilter struct {
	Query string // matched anywhere in name or sport, ignoring case
	Show  string // ShowActive (default), ShowArchived or ShowAll
}

const clientCols = `c.id, c.name, c.date_of_birth, c.sex, c.height_cm::float8, c.sport, c.notes, c.cautions, c.shared_note, c.athlete_sees_energy_mass,
	coalesce(c.mass_unit, ''), coalesce(c.mass_unit, (SELECT value FROM settings WHERE key = 'mass_unit'), 'kg'),
	c.archived_at, c.created_at, c.updated_at`

func clientDest(c *Client) []any {
	return []any{&c.ID, &c.Name, &c.DateOfBirth, &c.Sex, &c.HeightCm, &c.Sport, &c.Notes, &c.Cautions, &c.SharedNote, &c.AthleteSeesEnergyMass, &c.MassUnit, &c.Unit, &c.ArchivedAt, &c.CreatedAt, &c.UpdatedAt}
}

// searchWords splits a search into words, each a LIKE pattern taken
// literally; a client matches when every word is in the name or the sport,
// in any order ("solvik maren" finds Maren Solvik).
func searchWords(q string) []string {
	words := strings.Fields(q)
	out := make([]string, len(words))
	for i, w := range words {
		out[i] = likePattern(w)
	}
	return out
}

// foldSQL lower-cases a text expression and folds the accented Latin
// letters of names to their base letters, so "Tomas" finds "Tomás" and the
// other way round. (The unaccent extension would need a superuser.)
func foldSQL(expr string) string {
	return "translate(lower(" + expr + "), 'áàâäãåāăąéèêëēėęěíìîïīįóòôöõøōőúùûüūůűųýÿçćčñńňśšşžźżďđľĺłŕřťţğ', " +
		"'aaaaaaaaaeeeeeeeeiiiiiioooooooouuuuuuuuyycccnnnssszzzddlllrrttg')"
}

// ListClients lists clients by name with their latest body mass and next event.
func (s *Store) ListClients(ctx context.Context, f ClientFilter) ([]ClientRow, error) {
	show := f.Show
	if show != ShowArchived && show != ShowAll {
		show = ShowActive
	}
	rows, err := s.Pool.Query(ctx, `SELECT `+clientCols+`, bm.mass_kg::float8, bm.measured_on, coalesce(ev.name, ''), ev.starts_at, coalesce(ev.time_zone, '')
		FROM clients c
		LEFT JOIN LATERAL (SELECT mass_kg, measured_on FROM body_mass WHERE client_id = c.id
			ORDER BY measured_on DESC, id DESC LIMIT 1) bm ON true
		LEFT JOIN LATERAL (SELECT name, starts_at, time_zone FROM events WHERE client_id = c.id AND starts_at >= now() - interval '1 day'
			ORDER BY starts_at LIMIT 1) ev ON true
		WHERE NOT EXISTS (SELECT 1 FROM unnest($1::text[]) w
			WHERE NOT (`+foldSQL("c.name")+` LIKE `+foldSQL("w")+` OR `+foldSQL("c.sport")+` LIKE `+foldSQL("w")+`))
		  AND ($2 = 'all' OR ($2 = 'active') = (c.archived_at IS NULL))
		ORDER BY lower(c.name), c.id`, searchWords(f.Query), show)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (ClientRow, error) {
		var c ClientRow
		dest := append(clientDest(&c.Client), &c.LatestMassKg, &c.LatestMassOn, &c.NextEventName, &c.NextEventStart, &c.NextEventZone)
		err := r.Scan(dest...)
		return c, err
	})
}

const clientByIDSQL = `SELECT ` + clientCols + ` FROM clients c WHERE c.id = $1`

// ClientByID loads one client, archived or not.
func (s *Store) ClientByID(ctx context.Context, id int64) (Client, error) {
	var c Client
	err := s.Pool.QueryRow(ctx, clientByIDSQL, id).Scan(clientDest(&c)...)
	return c, notFound(err)
}

func clientDetail(c *Client) map[string]any {
	return map[string]any{"name": c.Name, "sex": c.Sex, "height_cm": c.HeightCm, "sport": c.Sport, "cautions": c.Cautions,
		"shared_note": c.SharedNote, "athlete_sees_energy_mass": c.AthleteSeesEnergyMass,
		"mass_unit": string(c.MassUnit)}
}

// CreateClient adds a client; c.ID and timestamps are filled in.
func (s *Store) CreateClient(ctx context.Context, actor Actor, c *Client) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := tx.QueryRow(ctx, `INSERT INTO clients (name, date_of_birth, sex, height_cm, sport, notes, cautions, shared_note, athlete_sees_energy_mass, mass_unit)
			VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, NULLIF($10, '')) RETURNING id, created_at, updated_at`,
			c.Name, c.DateOfBirth, c.Sex, c.HeightCm, c.Sport, c.Notes, c.Cautions, c.SharedNote, c.AthleteSeesEnergyMass, string(c.MassUnit)).Scan(&c.ID, &c.CreatedAt, &c.UpdatedAt); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "create", "client", c.ID, clientDetail(c))
	})
}

// UpdateClient saves a client's details (not its archived state).
func (s *Store) UpdateClient(ctx context.Context, actor Actor, c *Client) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE clients SET name = $2, date_of_birth = $3, sex = $4, height_cm = $5,
			sport = $6, notes = $7, cautions = $8, shared_note = $9, athlete_sees_energy_mass = $10, mass_unit = NULLIF($11, ''), updated_at = now() WHERE id = $1`,
			c.ID, c.Name, c.DateOfBirth, c.Sex, c.HeightCm, c.Sport, c.Notes, c.Cautions, c.SharedNote, c.AthleteSeesEnergyMass, string(c.MassUnit)); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "client", c.ID, clientDetail(c))
	})
}

// ArchiveClient hides a client from the default list; nothing is deleted.
func (s *Store) ArchiveClient(ctx context.Context, actor Actor, id int64) error {
	return s.setArchived(ctx, actor, id, true)
}

// UnarchiveClient brings an archived client back.
func (s *Store) UnarchiveClient(ctx context.Context, actor Actor, id int64) error {
	return s.setArchived(ctx, actor, id, false)
}

func (s *Store) setArchived(ctx context.Context, actor Actor, id int64, archive bool) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		q := `UPDATE clients SET archived_at = NULL, updated_at = now() WHERE id = $1 RETURNING name`
		action := "unarchive"
		if archive {
			q = `UPDATE clients SET archived_at = coalesce(archived_at, now()), updated_at = now() WHERE id = $1 RETURNING name`
			action = "archive"
		}
		var name string
		if err := tx.QueryRow(ctx, q, id).Scan(&name); err != nil {
			return notFound(err)
		}
		return AuditTx(ctx, tx, actor, action, "client", id, map[string]any{"name": name})
	})
}
