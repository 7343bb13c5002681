package store

import (
	"context"
	"time"

	"github.com/jackc/pgx/v5"
)

// UploadFile is one file of an upload awaiting confirmation.
type UploadFile struct {
	Name    string
	Content []byte
}

// Upload is a file (or several activity files) kept between its preview
// and the person's confirmation.
type Upload struct {
	ID        int64
	CreatedBy int64
	ClientID  *int64 // nil for a practice-wide file
	Kind      string // body_mass | training | activity
	CreatedAt time.Time
	Files     []UploadFile
}

// UploadKeep is how long an unconfirmed upload is kept.
const UploadKeep = 24 * time.Hour

// SaveUpload keeps an upload for its preview and confirmation, and deletes
// uploads older than UploadKeep (they hold health data nobody confirmed).
func (s *Store) SaveUpload(ctx context.Context, u *Upload) error {
	return s.inTx(ctx, func(tx pgx.Tx) error {
		if _, err := tx.Exec(ctx, `DELETE FROM import_uploads WHERE created_at < now() - $1::interval`, UploadKeep.String()); err != nil {
			return err
		}
		if err := tx.QueryRow(ctx, `INSERT INTO import_uploads (created_by, client_id, kind) VALUES ($1, $2, $3) RETURNING id, created_at`,
			u.CreatedBy, u.ClientID, u.Kind).Scan(&u.ID, &u.CreatedAt); err != nil {
			return err
		}
		for i, f := range u.Files {
			if _, err := tx.Exec(ctx, `INSERT INTO import_upload_files (upload_id, seq, name, content) VALUES ($1, $2, $3, $4)`,
				u.ID, i, truncate(f.Name, 255), f.Content); err != nil {
				return err
			}
		}
		return nil
	})
}

// UploadByID loads an upload made by the given user (someone else's upload
// is ErrNotFound).
func (s *Store) UploadByID(ctx context.Context, id, userID int64) (Upload, error) {
	var u Upload
	err := s.Pool.QueryRow(ctx, `SELECT id, created_by, client_id, kind, created_at FROM import_uploads
		WHERE id = $1 AND created_by = $2 AND created_at >= now() - $3::interval`, id, userID, UploadKeep.String()).
		Scan(&u.ID, &u.CreatedBy, &u.ClientID, &u.Kind, &u.CreatedAt)
	if err != nil {
		return u, notFound(err)
	}
	rows, err := s.Pool.Query(ctx, `SELECT name, content FROM import_upload_files WHERE upload_id = $1 ORDER BY seq`, id)
	if err != nil {
		return u, err
	}
	u.Files, err = pgx.CollectRows(rows, func(r pgx.CollectableRow) (UploadFile, error) {
		var f UploadFile
		err := r.Scan(&f.Name, &f.Content)
		return f, err
	})
	return u, err
}

// DeleteUpload forgets an upload once it is imported or abandoned.
func (s *Store) DeleteUpload(ctx context.Context, id int64) error {
	_, err := s.Pool.Exec(ctx, `DELETE FROM import_uploads WHERE id = $1`, id)
	return err
}
