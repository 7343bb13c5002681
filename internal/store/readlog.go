package store

import (
	"context"
	"encoding/json"
	"sync"
	"time"
)

// readLog writes recorded reads by group commit. Every request that
// records a read waits until its row is committed, so whoever got a page
// of health data also left its row, whatever happens to the app server
// afterwards; but the rows of reads that arrive together share one INSERT
// and one commit, sent without an explicit transaction: one round trip per
// batch instead of begin, insert and commit for every page view. While a
// batch is being written the next one gathers; there is no timer, so a
// lone read is written at once.
//
// The commit does not wait for its WAL to reach the disk (synchronous_commit
// off, for this statement's transaction only): a commit per page view that
// waits for a disk flush was most of a staff page's time. The cost: if the
// database server itself crashes (PostgreSQL or the machine, not the app),
// the read rows of the last moments before it — at most about three times
// wal_writer_delay, 0.6 s by default — can be lost. The database stays
// consistent, and every change to data (not a read) is still flushed before
// its commit returns.
type readLog struct {
	mu      sync.Mutex
	pending []pendingRead
	running bool // a writer goroutine is draining pending
}

type pendingRead struct {
	userID   *int64
	entity   string
	entityID *int64
	detail   []byte
	done     chan error
}

// maxReadBatch bounds one INSERT; more waiting rows go in the next one.
const maxReadBatch = 500

// readWriteTimeout bounds one batch's INSERT: a read that cannot be
// recorded in that time is reported to its request as an error.
const readWriteTimeout = 10 * time.Second

// add queues one row and waits for its commit (or ctx's end: the row is
// then still written, the request just stops waiting).
func (l *readLog) add(ctx context.Context, s *Store, p pendingRead) error {
	p.done = make(chan error, 1)
	l.mu.Lock()
	l.pending = append(l.pending, p)
	start := !l.running
	l.running = true
	l.mu.Unlock()
	if start {
		go l.drain(s)
	}
	select {
	case err := <-p.done:
		return err
	case <-ctx.Done():
		return ctx.Err()
	}
}

// drain writes batches until nothing waits, then ends.
func (l *readLog) drain(s *Store) {
	for {
		l.mu.Lock()
		batch := l.pending
		if len(batch) > maxReadBatch {
			batch = batch[:maxReadBatch:maxReadBatch]
		}
		l.pending = l.pending[len(batch):]
		if len(batch) == 0 {
			l.pending = nil
			l.running = false
			l.mu.Unlock()
			return
		}
		l.mu.Unlock()
		err := s.insertReads(batch)
		for _, p := range batch {
			p.done <- err
		}
	}
}

// insertReads writes a batch of read rows in one statement.
func (s *Store) insertReads(batch []pendingRead) error {
	users := make([]*int64, len(batch))
	entities := make([]string, len(batch))
	ids := make([]*int64, len(batch))
	details := make([]json.RawMessage, len(batch))
	for i, p := range batch {
		users[i], entities[i], ids[i], details[i] = p.userID, p.entity, p.entityID, p.detail
	}
	ctx, cancel := context.WithTimeout(context.Background(), readWriteTimeout)
	defer cancel()
	// set_config(..., true) holds for this statement's own (implicit)
	// transaction only; joined to the rows so it runs before they are made.
	_, err := s.Pool.Exec(ctx, `WITH async AS (SELECT set_config('synchronous_commit', 'off', true))
		INSERT INTO audit_log (user_id, action, entity, entity_id, detail)
		SELECT u, 'view', e, i, d FROM unnest($1::bigint[], $2::text[], $3::bigint[], $4::jsonb[]) AS r(u, e, i, d), async`,
		users, entities, ids, details)
	return err
}
