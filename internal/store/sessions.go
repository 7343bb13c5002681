package store

import (
	"context"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/jackc/pgx/v5"
)

// StaffSession is one signed-in session of a staff member, as they see it
// on their account page.
type StaffSession struct {
	ID        int64
	UserID    int64
	StartedAt time.Time
	ExpiresAt time.Time
	Address   string
	Agent     string
}

// clip shortens s to at most n bytes without cutting a character in two.
func clip(s string, n int) string {
	s = strings.ToValidUTF8(s, "")
	if len(s) <= n {
		return s
	}
	for n > 0 && !utf8.RuneStart(s[n]) {
		n--
	}
	return s[:n]
}

// StartSession records a new sign-in of userID and returns its id, which the
// cookie's session carries. Rows past their end are swept at the same time.
func (s *Store) StartSession(ctx context.Context, userID int64, expires time.Time, address, agent string) (int64, error) {
	var id int64
	err := s.Pool.QueryRow(ctx, `WITH gone AS (DELETE FROM staff_sessions WHERE expires_at < now())
		INSERT INTO staff_sessions (user_id, expires_at, address, agent) VALUES ($1, $2, $3, $4) RETURNING id`,
		userID, expires, clip(address, 64), clip(agent, 300)).Scan(&id)
	return id, err
}

// SessionUser loads the user of a session: ErrNotFound when the session has
// been ended (password change, sign-out elsewhere) or has run out. The
// practice's name comes in the same round trip, since every staff page
// shows it in its header.
func (s *Store) SessionUser(ctx context.Context, userID, sessionID int64) (u User, practiceName string, err error) {
	err = s.Pool.QueryRow(ctx, `SELECT `+prefixed("u.", userCols)+`,
			coalesce((SELECT value FROM settings WHERE key = $3), $4)
		FROM users u
		JOIN staff_sessions ss ON ss.user_id = u.id
		WHERE u.id = $1 AND ss.id = $2 AND ss.expires_at > now()`, userID, sessionID, SettingPracticeName, DefaultPracticeName).
		Scan(&u.ID, &u.Email, &u.Name, &u.PasswordHash, &u.Role, &u.Disabled, &u.CreatedAt, &u.Version, &practiceName)
	return u, practiceName, notFound(err)
}

// prefixed qualifies each column of a comma-separated list with p.
func prefixed(p, cols string) string {
	parts := strings.Split(cols, ",")
	for i, c := range parts {
		parts[i] = p + strings.TrimSpace(c)
	}
	return strings.Join(parts, ", ")
}

// ListSessions lists a user's sessions that have not run out, newest first.
func (s *Store) ListSessions(ctx context.Context, userID int64) ([]StaffSession, error) {
	rows, err := s.Pool.Query(ctx, `SELECT id, user_id, started_at, expires_at, address, agent FROM staff_sessions
		WHERE user_id = $1 AND expires_at > now() ORDER BY started_at DESC, id DESC`, userID)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (StaffSession, error) {
		var ss StaffSession
		err := r.Scan(&ss.ID, &ss.UserID, &ss.StartedAt, &ss.ExpiresAt, &ss.Address, &ss.Agent)
		return ss, err
	})
}

// EndSession ends one session of userID (ErrNotFound when userID has no
// such session, so nobody can end another person's session by its id).
func (s *Store) EndSession(ctx context.Context, actor Actor, userID, sessionID int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `DELETE FROM staff_sessions WHERE id = $1 AND user_id = $2`, sessionID, userID); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "end_session", "user", userID, map[string]any{"session": sessionID})
	})
}

// endSessionsTx ends every session of userID except keep (0 keeps none).
func endSessionsTx(ctx context.Context, tx pgx.Tx, userID, keep int64) (int64, error) {
	tag, err := tx.Exec(ctx, `DELETE FROM staff_sessions WHERE user_id = $1 AND id <> $2`, userID, keep)
	return tag.RowsAffected(), err
}

// SignOut ends the session sessionID of userID and records the sign-out.
func (s *Store) SignOut(ctx context.Context, userID, sessionID int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `DELETE FROM staff_sessions WHERE id = $1 AND user_id = $2`, sessionID, userID); err != nil {
			return err
		}
		return AuditTx(ctx, tx, Actor(userID), "sign_out", "user", userID, nil)
	})
}
