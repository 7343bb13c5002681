package store

import (
	"context"
	"fmt"

	lru "github.com/hashicorp/golang-lru/v2"
)

// A published or superseded plan version never changes again: the
// plan_versions_frozen trigger refuses any edit of its request, result,
// body mass, number or plan, and its feeds are only ever written while it
// is a draft. So a decoded copy, keyed by the version's id, is right for as
// long as the row exists, on every app server at once: publishing anew
// makes a new version with a new id, which simply misses the cache. Only
// the status moves (published → superseded), and it is not cached.

// frozenCacheSize bounds the decoded versions kept in memory. A decoded
// version of a long plan is some tens of KB, so this stays within a few MB
// while holding every plan a busy practice's clients are looking at.
const frozenCacheSize = 256

// FrozenVersion is a version that can no longer change, with its stored
// food suggestions. It is shared between requests: read it, never modify it
// (copy a slice or map before changing it).
type FrozenVersion struct {
	Version     PlanVersion // Status as it was when loaded: ask the database for the current one
	Suggestions map[string]string
}

type frozenCache = lru.Cache[int64, *FrozenVersion]

func newFrozenCache() *frozenCache {
	c, err := lru.New[int64, *FrozenVersion](frozenCacheSize)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return c
}

// FrozenVersionByID loads a published or superseded version and its food
// suggestions, from the in-process cache when it is there. A draft is
// refused (ErrNotDraft's opposite: it may still change), as ErrNotFound.
func (s *Store) FrozenVersionByID(ctx context.Context, id int64) (*FrozenVersion, error) {
	if s.frozen != nil {
		if fv, ok := s.frozen.Get(id); ok {
			return fv, nil
		}
	}
	v, err := scanVersion(s.Pool.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.id = $1 AND v.status <> 'draft'`, id))
	if err != nil {
		return nil, err
	}
	sugg, err := suggestionsOf(ctx, s.Pool, id)
	if err != nil {
		return nil, fmt.Errorf("plan version %d suggestions: %w", id, err)
	}
	fv := &FrozenVersion{Version: v, Suggestions: sugg}
	if s.frozen != nil {
		s.frozen.Add(id, fv)
	}
	return fv, nil
}
