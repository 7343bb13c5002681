package store

import (
	"context"
	"errors"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
)

// Roles of staff users.
const (
	RoleAdmin     = "admin"     // manages staff, foods and practice settings
	RoleDietitian = "dietitian" // works with clients and plans
)

// User is a staff account.
type User struct {
	ID           int64
	Email        string
	Name         string
	PasswordHash string
	Role         string
	Disabled     bool
	CreatedAt    time.Time
	// Version rises on every change to the account (role, disabled,
	// password); the Team page's forms carry it (see ExpectVersion).
	Version int
}

// IsAdmin reports whether the user may manage staff.
func (u User) IsAdmin() bool { return u.Role == RoleAdmin }

// ErrEmailTaken is returned when another user already has the email
// (compared without regard to case).
var ErrEmailTaken = errors.New("store: email already in use")

// ErrUsersExist is returned by CreateFirstUser once any user exists.
var ErrUsersExist = errors.New("store: a user already exists")

const userCols = `id, email, name, password_hash, role, disabled, created_at, version`

func scanUser(row pgx.Row) (User, error) {
	var u User
	err := row.Scan(&u.ID, &u.Email, &u.Name, &u.PasswordHash, &u.Role, &u.Disabled, &u.CreatedAt, &u.Version)
	return u, notFound(err)
}

// CountUsers counts staff accounts (the setup page shows only while none exist).
func (s *Store) CountUsers(ctx context.Context) (int, error) {
	var n int
	err := s.Pool.QueryRow(ctx, `SELECT count(*) FROM users`).Scan(&n)
	return n, err
}

func insertUser(ctx context.Context, tx pgx.Tx, actor Actor, u *User) error {
	u.Email = strings.TrimSpace(u.Email)
	err := tx.QueryRow(ctx, `INSERT INTO users (email, name, password_hash, role, disabled)
		VALUES ($1, $2, $3, $4, $5) RETURNING id, created_at`,
		u.Email, u.Name, u.PasswordHash, u.Role, u.Disabled).Scan(&u.ID, &u.CreatedAt)
	if isUniqueViolation(err) {
		return ErrEmailTaken
	}
	if err != nil {
		return err
	}
	return AuditTx(ctx, tx, actor, "create", "user", u.ID, map[string]any{"email": u.Email, "role": u.Role})
}

// CreateUser adds a staff account; u.ID and u.CreatedAt are filled in.
func (s *Store) CreateUser(ctx context.Context, actor Actor, u *User) error {
	return s.inTx(ctx, func(tx pgx.Tx) error { return insertUser(ctx, tx, actor, u) })
}

// CreateFirstUser adds u only while no user exists at all; the table lock
// makes two simultaneous setup requests produce one account, not two.
func (s *Store) CreateFirstUser(ctx context.Context, u *User) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `LOCK TABLE users IN SHARE ROW EXCLUSIVE MODE`); err != nil {
			return err
		}
		var n int
		if err := tx.QueryRow(ctx, `SELECT count(*) FROM users`).Scan(&n); err != nil {
			return err
		}
		if n > 0 {
			return ErrUsersExist
		}
		return insertUser(ctx, tx, System, u)
	})
}

// UserByEmail finds a user by email, ignoring case.
func (s *Store) UserByEmail(ctx context.Context, email string) (User, error) {
	return scanUser(s.Pool.QueryRow(ctx, `SELECT `+userCols+` FROM users WHERE lower(email) = lower($1)`, strings.TrimSpace(email)))
}

// UserByID finds a user by id.
func (s *Store) UserByID(ctx context.Context, id int64) (User, error) {
	return scanUser(s.Pool.QueryRow(ctx, `SELECT `+userCols+` FROM users WHERE id = $1`, id))
}

// ListUsers lists all staff, enabled first, then by name.
func (s *Store) ListUsers(ctx context.Context) ([]User, error) {
	rows, err := s.Pool.Query(ctx, `SELECT `+userCols+` FROM users ORDER BY disabled, lower(name), id`)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (User, error) { return scanUser(r) })
}

// SetUserRole changes a user's role.
func (s *Store) SetUserRole(ctx context.Context, actor Actor, id int64, role string) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE users SET role = $2 WHERE id = $1`, id, role); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "change_role", "user", id, map[string]any{"role": role})
	})
}

// SetUserDisabled disables or re-enables a user. Disabling ends all of the
// user's sessions (and every request reloads the user, so a disabled
// account is refused even before that).
func (s *Store) SetUserDisabled(ctx context.Context, actor Actor, id int64, disabled bool) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE users SET disabled = $2 WHERE id = $1`, id, disabled); err != nil {
			return err
		}
		action := "enable"
		if disabled {
			action = "disable"
			if _, err := endSessionsTx(ctx, tx, id, 0); err != nil {
				return err
			}
		}
		return AuditTx(ctx, tx, actor, action, "user", id, nil)
	})
}

// SetUserPassword stores a new password hash (own change or admin reset)
// and ends every session of the user but keepSession (the session making
// the change, when the user changes their own password; 0 ends them all):
// whoever knew the old password is signed out everywhere at once.
func (s *Store) SetUserPassword(ctx context.Context, actor Actor, id int64, hash string, keepSession int64) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if err := execOne(ctx, tx, `UPDATE users SET password_hash = $2 WHERE id = $1`, id, hash); err != nil {
			return err
		}
		ended, err := endSessionsTx(ctx, tx, id, keepSession)
		if err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "set_password", "user", id, map[string]any{"sessions_ended": ended})
	})
}

// CountActiveAdmins counts enabled admins, so the last one cannot be demoted
// or disabled and lock the practice out of its Team page.
func (s *Store) CountActiveAdmins(ctx context.Context) (int, error) {
	var n int
	err := s.Pool.QueryRow(ctx, `SELECT count(*) FROM users WHERE role = 'admin' AND NOT disabled`).Scan(&n)
	return n, err
}
