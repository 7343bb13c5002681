package store

import (
	"context"
	"errors"
	"fmt"

	lru "github.com/hashicorp/golang-lru/v2"
	"github.com/jackc/pgx/v5"
)

// A draft changes, but never without its revision moving: every save
// counts it up, and the plan_versions_revision_moves trigger does it for
// any other writer. So (version id, revision) names one content for good,
// on every app server, and the decoded request and result of a draft can be
// kept under that key: a plan page shows a draft without sending and
// decoding its JSON (tens of KB) on every view, and a save — here or on
// another server — simply misses the cache.

// draftCacheSize bounds the decoded drafts kept in memory: the drafts being
// worked on now, some tens of KB each.
const draftCacheSize = 64

type draftKey struct {
	id       int64
	revision int
}

// draftContent is a draft's decoded content, shared between requests:
// read it, never modify it.
type draftContent struct {
	v PlanVersion // Request and Result only
}

type draftCache = lru.Cache[draftKey, *draftContent]

func newDraftCache() *draftCache {
	c, err := lru.New[draftKey, *draftContent](draftCacheSize)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return c
}

// fillDrafts sets the content of the drafts out[i], i in drafts, listed
// without it: from the cache under (id, revision), else read and decoded
// now. A draft saved since it was listed is read as it is now, with its
// new revision, so the page's content and the revision its forms carry
// always match.
func (s *Store) fillDrafts(ctx context.Context, out []PlanVersion, drafts []int) error {
	for _, i := range drafts {
		v := &out[i]
		if s.drafts != nil {
			if dc, ok := s.drafts.Get(draftKey{v.ID, v.Revision}); ok {
				v.Request, v.Result = dc.v.Request, dc.v.Result
				continue
			}
		}
		var req, res []byte
		err := s.Pool.QueryRow(ctx, `SELECT revision, request, result, body_mass_kg::float8, body_mass_on
			FROM plan_versions WHERE id = $1 AND status = 'draft'`, v.ID).Scan(&v.Revision, &req, &res, &v.BodyMassKg, &v.BodyMassOn)
		if errors.Is(err, pgx.ErrNoRows) {
			return fmt.Errorf("plan version %d: published or discarded while read: %w", v.ID, ErrNotFound)
		}
		if err != nil {
			return err
		}
		if err := decodeContent(v, req, res); err != nil {
			return err
		}
		if s.drafts != nil {
			s.drafts.Add(draftKey{v.ID, v.Revision}, &draftContent{v: PlanVersion{Request: v.Request, Result: v.Result}})
		}
	}
	return nil
}
