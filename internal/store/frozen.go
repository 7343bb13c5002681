package store

import (
	"context"
	"encoding/json"
	"fmt"
	"maps"
	"strings"

	lru "github.com/hashicorp/golang-lru/v2"
	"github.com/jackc/pgx/v5"
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

// versionListCols are versionCols with the request and result read only
// for drafts: a frozen version's content comes from FrozenVersionByID, so
// listing a plan's versions sends and decodes each one's JSON once per
// app server instead of on every page view.
var versionListCols = strings.Replace(versionCols, "v.request, v.result,",
	"CASE WHEN v.status = 'draft' THEN v.request END, CASE WHEN v.status = 'draft' THEN v.result END,", 1)

// scanListedVersion scans a row of versionListCols; the status, names and
// times are the row's own (they may move), the content the cache's.
func (s *Store) scanListedVersion(ctx context.Context, row pgx.Row) (PlanVersion, error) {
	v, req, res, err := scanVersionRow(row)
	if err != nil {
		return v, err
	}
	if v.Status == PlanDraft {
		return v, decodeContent(&v, req, res)
	}
	fv, err := s.FrozenVersionByID(ctx, v.ID)
	if err != nil {
		return v, err
	}
	v.Request, v.Result = fv.Version.Request, fv.Version.Result
	return v, nil
}

// PlanVersions lists a plan's versions, newest first. The content of
// published and superseded versions is shared with the cache: read it only.
func (s *Store) PlanVersions(ctx context.Context, planID int64) ([]PlanVersion, error) {
	rows, err := s.Pool.Query(ctx, planVersionsSQL, planID)
	if err != nil {
		return nil, err
	}
	// Collect first: a cache miss queries again, which a pool connection
	// still busy with these rows cannot do.
	out, frozen, _, err := collectListedVersions(rows)
	if err != nil {
		return nil, err
	}
	return out, s.fillFrozen(ctx, out, frozen)
}

var planVersionsSQL = `SELECT ` + versionListCols + versionFrom + `WHERE v.plan_id = $1 ORDER BY v.version DESC`

// planVersionsBareSQL lists a plan's versions without any content: drafts
// too come from a cache (fillDrafts).
var planVersionsBareSQL = `SELECT ` + strings.Replace(versionCols, "v.request, v.result,", "NULL::jsonb, NULL::jsonb,", 1) +
	versionFrom + `WHERE v.plan_id = $1 ORDER BY v.version DESC`

// collectListedVersions reads rows of versionListCols, decoding drafts;
// frozen holds the indexes of the versions whose content is still to come
// from the cache (fillFrozen). Rows of planVersionsBareSQL carry no draft
// content either: drafts then holds the drafts' indexes (fillDrafts).
func collectListedVersions(rows pgx.Rows) (out []PlanVersion, frozen, drafts []int, err error) {
	defer rows.Close()
	for rows.Next() {
		var v PlanVersion
		var req, res []byte
		if err := rows.Scan(&v.ID, &v.PlanID, &v.Version, &v.Status, &req, &res, &v.BodyMassKg, &v.BodyMassOn,
			&v.Revision, &v.CreatedByName, &v.CreatedAt, &v.UpdatedByName, &v.UpdatedAt, &v.PublishedAt, &v.Notes); err != nil {
			return nil, nil, nil, err
		}
		if v.Status == PlanDraft && req == nil {
			drafts = append(drafts, len(out))
		} else if v.Status == PlanDraft {
			if err := decodeContent(&v, req, res); err != nil {
				return nil, nil, nil, err
			}
		} else {
			frozen = append(frozen, len(out))
		}
		out = append(out, v)
	}
	return out, frozen, drafts, rows.Err()
}

// fillFrozen sets the content of the frozen versions out[i], i in frozen.
func (s *Store) fillFrozen(ctx context.Context, out []PlanVersion, frozen []int) error {
	for _, i := range frozen {
		fv, err := s.FrozenVersionByID(ctx, out[i].ID)
		if err != nil {
			return err
		}
		out[i].Request, out[i].Result = fv.Version.Request, fv.Version.Result
	}
	return nil
}

// PlanVersion loads version number `number` of a plan.
func (s *Store) PlanVersion(ctx context.Context, planID int64, number int) (PlanVersion, error) {
	return s.scanListedVersion(ctx, s.Pool.QueryRow(ctx, `SELECT `+versionListCols+versionFrom+`WHERE v.plan_id = $1 AND v.version = $2`, planID, number))
}

// PublishedPlanVersion loads the published version of a plan, or ErrNotFound.
func (s *Store) PublishedPlanVersion(ctx context.Context, planID int64) (PlanVersion, error) {
	return s.scanListedVersion(ctx, s.Pool.QueryRow(ctx, `SELECT `+versionListCols+versionFrom+`WHERE v.plan_id = $1 AND v.status = 'published'`, planID))
}

// FeedSuggestions returns the stored food suggestions of a version, by
// FeedKey: a frozen version's from the cache when it is there (a copy, so
// the caller may change it).
func (s *Store) FeedSuggestions(ctx context.Context, versionID int64) (map[string]string, error) {
	if s.frozen != nil {
		if fv, ok := s.frozen.Get(versionID); ok {
			return maps.Clone(fv.Suggestions), nil
		}
	}
	return suggestionsOf(ctx, s.Pool, versionID)
}

func decodeContent(v *PlanVersion, req, res []byte) error {
	if err := json.Unmarshal(req, &v.Request); err != nil {
		return fmt.Errorf("plan version %d request: %w", v.ID, err)
	}
	if err := json.Unmarshal(res, &v.Result); err != nil {
		return fmt.Errorf("plan version %d result: %w", v.ID, err)
	}
	return nil
}
