package store

import (
	"context"
	"errors"

	"github.com/jackc/pgx/v5"
)

// SignIn is what SessionWithUser found beside a session's data: the staff
// member and staff_sessions row the session's row names (0 when it names
// none, as rows saved before those columns do), and, when that row is
// still live, its user and the practice's name.
type SignIn struct {
	UserID, SessionID int64
	// Live is false when the staff_sessions row has been ended or has run
	// out, or the user is gone: the session signs nobody in.
	Live     bool
	User     User
	Practice string
}

// SessionWithUser reads a scs session's data by its token (found is false
// when there is none or it has run out) together with the user it signs
// in, in one round trip: what SessionUser would read, read from the row's
// own copy of the user and staff-session ids. The caller must check those
// ids against the ones in the data (the columns are copied on save).
func (s *Store) SessionWithUser(ctx context.Context, token string) (data []byte, found bool, in SignIn, err error) {
	var uid, sid *int64
	var user *int64
	u := &in.User
	err = s.Pool.QueryRow(ctx, `SELECT s.data, s.user_id, s.staff_session_id, u.id,
			coalesce(u.email, ''), coalesce(u.name, ''), coalesce(u.password_hash, ''), coalesce(u.role, ''),
			coalesce(u.disabled, false), coalesce(u.created_at, 'epoch'), coalesce(u.version, 0),
			coalesce((SELECT value FROM settings WHERE key = $2), $3)
		FROM sessions s
		LEFT JOIN staff_sessions ss ON ss.id = s.staff_session_id AND ss.user_id = s.user_id AND ss.expires_at > now()
		LEFT JOIN users u ON u.id = ss.user_id
		WHERE s.token = $1 AND current_timestamp < s.expiry`, token, SettingPracticeName, DefaultPracticeName).
		Scan(&data, &uid, &sid, &user, &u.Email, &u.Name, &u.PasswordHash, &u.Role, &u.Disabled, &u.CreatedAt, &u.Version, &in.Practice)
	if errors.Is(err, pgx.ErrNoRows) {
		return nil, false, SignIn{}, nil
	}
	if err != nil {
		return nil, false, SignIn{}, err
	}
	if uid != nil {
		in.UserID = *uid
	}
	if sid != nil {
		in.SessionID = *sid
	}
	if user != nil {
		in.Live, u.ID = true, *user
	}
	return data, true, in, nil
}
