package store

import (
	"context"
	"encoding/json"
	"time"

	"github.com/jackc/pgx/v5"
)

// Read kinds: what a staff member opened.
const (
	ReadClient = "client"     // the client's record page
	ReadPlan   = "plan"       // a plan page (any version)
	ReadSheet  = "plan_sheet" // a plan sheet PDF
	ReadExport = "export"     // an export of the client's records
)

// ReadRecord is what AuditRead records.
type ReadRecord struct {
	Kind     string // one of the Read* kinds
	ClientID int64
	PlanID   int64 // 0 when not a plan
	Version  int   // 0 when not one version
	Path     string
}

// AuditRead records that actor opened a client's health data, in the same
// audit log as changes (action "view"). It returns once the row is
// committed; reads recorded at the same moment share one commit (readLog).
func (s *Store) AuditRead(ctx context.Context, actor Actor, rec ReadRecord) error {
	detail := map[string]any{"client_id": rec.ClientID, "path": clip(rec.Path, 300)}
	if rec.PlanID != 0 {
		detail["plan_id"] = rec.PlanID
	}
	if rec.Version != 0 {
		detail["version"] = rec.Version
	}
	id := rec.ClientID
	if rec.PlanID != 0 {
		id = rec.PlanID
	}
	b, err := json.Marshal(detail)
	if err != nil {
		return err
	}
	p := pendingRead{entity: rec.Kind, detail: b}
	if actor != System {
		v := int64(actor)
		p.userID = &v
	}
	if id != 0 {
		p.entityID = &id
	}
	if s.reads == nil { // a Store made without New
		return s.insertReads([]pendingRead{p})
	}
	return s.reads.add(ctx, s, p)
}

// ReadEntry is one recorded read, with the client's name for the list.
type ReadEntry struct {
	ID         int64
	At         time.Time
	UserID     *int64
	UserName   string
	Kind       string
	ClientID   int64
	ClientName string // empty when the client has since been erased
	PlanID     *int64
	Version    *int
	Path       string
	File       string // the file of an export (a table's CSV, or the whole record's zip)
}

// ReadFilter narrows the list of reads; zero fields do not filter.
type ReadFilter struct {
	ClientID int64
	UserID   int64
	BeforeID int64 // only reads older than this row (the next page)
	Limit    int
}

// ListReads lists recorded reads, newest first: the pages opened (action
// "view") and the exports taken (action "export", recorded by the export
// itself with the file), which carry a copy of the health data out.
func (s *Store) ListReads(ctx context.Context, f ReadFilter) ([]ReadEntry, error) {
	if f.Limit <= 0 || f.Limit > 500 {
		f.Limit = 100
	}
	rows, err := s.Pool.Query(ctx, `SELECT a.id, a.at, a.user_id, coalesce(u.name, ''),
			CASE WHEN a.action = 'export' THEN '`+ReadExport+`' ELSE a.entity END,
			coalesce((a.detail->>'client_id')::bigint, 0), coalesce(c.name, ''),
			(a.detail->>'plan_id')::bigint, (a.detail->>'version')::int, coalesce(a.detail->>'path', ''),
			CASE WHEN a.action = 'export' THEN coalesce(a.detail->>'file', '') ELSE '' END
		FROM audit_log a
		LEFT JOIN users u ON u.id = a.user_id
		LEFT JOIN clients c ON c.id = (a.detail->>'client_id')::bigint
		WHERE (a.action = 'view' OR (a.action = 'export' AND a.entity = 'client'))
		  AND ($1 = 0 OR (a.detail->>'client_id')::bigint = $1)
		  AND ($2 = 0 OR a.user_id = $2)
		  AND ($3 = 0 OR a.id < $3)
		ORDER BY a.at DESC, a.id DESC LIMIT $4`, f.ClientID, f.UserID, f.BeforeID, f.Limit)
	if err != nil {
		return nil, err
	}
	return pgx.CollectRows(rows, func(r pgx.CollectableRow) (ReadEntry, error) {
		var e ReadEntry
		err := r.Scan(&e.ID, &e.At, &e.UserID, &e.UserName, &e.Kind, &e.ClientID, &e.ClientName, &e.PlanID, &e.Version, &e.Path, &e.File)
		return e, err
	})
}
