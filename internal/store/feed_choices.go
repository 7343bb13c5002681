package store

import (
	"context"
	"strconv"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/menu"
)

// A feed's food is either the suggestion computed with the version
// (plan_feeds.suggestion) or, when the dietitian chose one, the lines of
// plan_feed_choices. Every reader of a version's food plans goes through
// suggestionsOf, which puts the choice in the suggestion's place, so the
// plan page, the sheet, the calendar and the phone page show one text per
// feed.

// querier is a pool or a transaction: what a read needs.
type querier interface {
	Query(ctx context.Context, sql string, args ...any) (pgx.Rows, error)
}

// computedSuggestionsOf reads the suggestions computed with a version's
// feeds, without the dietitian's choices: what a new version copies.
func computedSuggestionsOf(ctx context.Context, q querier, versionID int64) (map[string]string, error) {
	rows, err := q.Query(ctx, `SELECT kind, on_date::text, feed_index, suggestion FROM plan_feeds WHERE plan_version_id = $1 AND suggestion <> ''`, versionID)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	out := map[string]string{}
	for rows.Next() {
		var kind, date, text string
		var i int
		if err := rows.Scan(&kind, &date, &i, &text); err != nil {
			return nil, err
		}
		out[FeedKey(kind, date, i)] = text
	}
	return out, rows.Err()
}

// suggestionsOf reads the food plan of each feed of a version, by FeedKey:
// the dietitian's choice where there is one (menu.ChoiceText), else the
// computed suggestion. The pre-event meal and a repletion feed that are
// also a feed of a day (the same time) show that day feed's choice, so a
// feed listed twice still has one food plan.
func suggestionsOf(ctx context.Context, q querier, versionID int64) (map[string]string, error) {
	rows, err := q.Query(ctx, feedPlansSelect+`WHERE f.plan_version_id = $1`+feedPlansOrder, versionID)
	if err != nil {
		return nil, err
	}
	return collectFeedPlans(rows)
}

// feedPlansSelect, a WHERE on f (plan_feeds) and feedPlansOrder read the
// rows collectFeedPlans turns into food plans by feed.
const (
	feedPlansSelect = `SELECT f.kind, f.on_date::text, f.feed_index, f.at, f.suggestion,
			c.id IS NOT NULL, coalesce(c.free, false), coalesce(c.food_id, 0), coalesce(c.name, ''),
			coalesce(c.amount_g, 0)::float8, coalesce(c.unit, 'g'), coalesce(c.cho_g, 0)::float8, coalesce(c.protein_g, 0)::float8
		FROM plan_feeds f LEFT JOIN plan_feed_choices c ON c.plan_version_id = f.plan_version_id
			AND c.kind = f.kind AND c.on_date = f.on_date AND c.feed_index = f.feed_index `
	feedPlansOrder = ` ORDER BY f.kind, f.on_date, f.feed_index, c.line`
)

// collectFeedPlans is suggestionsOf's reading of its rows.
func collectFeedPlans(rows pgx.Rows) (map[string]string, error) {
	defer rows.Close()
	type feed struct {
		kind  string
		at    time.Time
		text  string
		lines []menu.ChoiceLine
	}
	feeds := map[string]*feed{}
	var order []string
	for rows.Next() {
		var kind, date, text string
		var i int
		var at time.Time
		var has bool
		var l menu.ChoiceLine
		if err := rows.Scan(&kind, &date, &i, &at, &text, &has, &l.Free, &l.FoodID, &l.Name, &l.Grams, &l.Unit, &l.ChoG, &l.ProteinG); err != nil {
			return nil, err
		}
		key := FeedKey(kind, date, i)
		f, ok := feeds[key]
		if !ok {
			f = &feed{kind: kind, at: at, text: text}
			feeds[key] = f
			order = append(order, key)
		}
		if has {
			f.lines = append(f.lines, l)
		}
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	chosenAt := map[int64]string{} // a day feed's chosen text by its time
	for _, key := range order {
		if f := feeds[key]; f.kind == "day" && len(f.lines) > 0 {
			chosenAt[f.at.UnixNano()] = menu.ChoiceText(f.lines)
		}
	}
	out := map[string]string{}
	for _, key := range order {
		f := feeds[key]
		text := f.text
		if len(f.lines) > 0 {
			text = menu.ChoiceText(f.lines)
		} else if t, ok := chosenAt[f.at.UnixNano()]; ok && f.kind != "day" {
			text = t
		}
		if text != "" {
			out[key] = text
		}
	}
	return out, nil
}

// FeedChoices loads the dietitian's food choices of a version, by FeedKey.
func (s *Store) FeedChoices(ctx context.Context, versionID int64) (map[string][]menu.ChoiceLine, error) {
	rows, err := s.Pool.Query(ctx, feedChoicesSelect+`WHERE plan_version_id = $1`+feedChoicesOrder, versionID)
	if err != nil {
		return nil, err
	}
	return collectFeedChoices(rows)
}

// feedChoicesSelect, a WHERE and feedChoicesOrder read the rows
// collectFeedChoices gathers by feed.
const (
	feedChoicesSelect = `SELECT kind, on_date::text, feed_index, free, coalesce(food_id, 0), name,
			coalesce(amount_g, 0)::float8, unit, cho_g::float8, protein_g::float8
		FROM plan_feed_choices `
	feedChoicesOrder = ` ORDER BY kind, on_date, feed_index, line`
)

// collectFeedChoices is FeedChoices' reading of its rows.
func collectFeedChoices(rows pgx.Rows) (map[string][]menu.ChoiceLine, error) {
	defer rows.Close()
	out := map[string][]menu.ChoiceLine{}
	for rows.Next() {
		var kind, date string
		var i int
		var l menu.ChoiceLine
		if err := rows.Scan(&kind, &date, &i, &l.Free, &l.FoodID, &l.Name, &l.Grams, &l.Unit, &l.ChoG, &l.ProteinG); err != nil {
			return nil, err
		}
		key := FeedKey(kind, date, i)
		out[key] = append(out[key], l)
	}
	return out, rows.Err()
}

// copyFeedChoices copies the food choices of one version into another.
func copyFeedChoices(ctx context.Context, tx pgx.Tx, from, to int64) error {
	_, err := tx.Exec(ctx, `INSERT INTO plan_feed_choices (plan_version_id, kind, on_date, feed_index, line, free, food_id, name, amount_g, unit, cho_g, protein_g, created_by, created_at)
		SELECT $2, kind, on_date, feed_index, line, free, food_id, name, amount_g, unit, cho_g, protein_g, created_by, created_at
		FROM plan_feed_choices WHERE plan_version_id = $1`, from, to)
	return err
}

// SetFeedChoice replaces the dietitian's food choice of one feed of a
// draft (kind, date and index as in FeedKey) with lines; no lines puts the
// computed suggestion back. Like any save of the draft it needs the
// revision the caller edited (ErrStaleRevision, ErrNotDraft otherwise;
// nothing is written) and returns the version as saved. A feed the version
// does not have is ErrNotFound.
func (s *Store) SetFeedChoice(ctx context.Context, actor Actor, versionID int64, revision int, kind, date string, index int, lines []menu.ChoiceLine) (PlanVersion, error) {
	var v PlanVersion
	err := s.inTx(ctx, func(tx pgx.Tx) error {
		if err := lockDraft(ctx, tx, versionID, revision); err != nil {
			return err
		}
		var n int
		if err := tx.QueryRow(ctx, `SELECT count(*) FROM plan_feeds WHERE plan_version_id = $1 AND kind = $2 AND on_date = $3 AND feed_index = $4`,
			versionID, kind, date, index).Scan(&n); err != nil {
			return err
		}
		if n == 0 {
			return ErrNotFound
		}
		if _, err := tx.Exec(ctx, `DELETE FROM plan_feed_choices WHERE plan_version_id = $1 AND kind = $2 AND on_date = $3 AND feed_index = $4`,
			versionID, kind, date, index); err != nil {
			return err
		}
		b := &pgx.Batch{}
		for i, l := range lines {
			var food *int64
			var amount *float64
			unit := menu.UnitGrams
			if l.Unit != "" && !l.Free {
				unit = l.Unit
			}
			if !l.Free {
				amount = &l.Grams
				if l.FoodID != 0 {
					food = &l.FoodID
				}
			}
			b.Queue(`INSERT INTO plan_feed_choices (plan_version_id, kind, on_date, feed_index, line, free, food_id, name, amount_g, unit, cho_g, protein_g, created_by)
				VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13)`,
				versionID, kind, date, index, i, l.Free, food, strings.TrimSpace(l.Name), amount, unit, l.ChoG, l.ProteinG, actorID(actor))
		}
		if err := tx.SendBatch(ctx, b).Close(); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plan_versions SET revision = revision + 1, updated_by = $2, updated_at = now() WHERE id = $1`,
			versionID, actorID(actor)); err != nil {
			return err
		}
		var err error
		if v, err = scanVersion(tx.QueryRow(ctx, `SELECT `+versionCols+versionFrom+`WHERE v.id = $1`, versionID)); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plans SET updated_at = now() WHERE id = $1`, v.PlanID); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "plan", v.PlanID, map[string]any{"version": v.Version, "revision": v.Revision,
			"feed": FeedKey(kind, date, index), "food_choice_lines": strconv.Itoa(len(lines))})
	})
	return v, err
}

// ComputedSuggestions returns the suggestions computed with a version's
// feeds, by FeedKey, without the dietitian's choices in their place.
func (s *Store) ComputedSuggestions(ctx context.Context, versionID int64) (map[string]string, error) {
	return computedSuggestionsOf(ctx, s.Pool, versionID)
}

// RemoveSetAsideChoices removes from a draft the food choices of the feeds
// named by keys (FeedKey) that the version no longer has: choices set aside
// when a change of the plan took their feed away. A choice whose feed still
// exists is left alone whatever keys say; it is changed on its feed's food
// page. Like any save of the draft it needs the revision the caller edited
// (ErrStaleRevision, ErrNotDraft otherwise; nothing is written); removed is
// how many feeds' choices went.
func (s *Store) RemoveSetAsideChoices(ctx context.Context, actor Actor, versionID int64, revision int, keys []string) (removed int, err error) {
	err = s.inTx(ctx, func(tx pgx.Tx) error {
		if err := lockDraft(ctx, tx, versionID, revision); err != nil {
			return err
		}
		if err := tx.QueryRow(ctx, `WITH gone AS (
				DELETE FROM plan_feed_choices c
				WHERE c.plan_version_id = $1 AND (c.kind || ':' || c.on_date::text || ':' || c.feed_index) = ANY($2)
				AND NOT EXISTS (SELECT 1 FROM plan_feeds f WHERE f.plan_version_id = c.plan_version_id
					AND f.kind = c.kind AND f.on_date = c.on_date AND f.feed_index = c.feed_index)
				RETURNING c.kind, c.on_date, c.feed_index)
			SELECT count(DISTINCT (kind, on_date, feed_index)) FROM gone`, versionID, keys).Scan(&removed); err != nil {
			return err
		}
		if removed == 0 {
			return nil
		}
		var planID int64
		var version, rev int
		if err := tx.QueryRow(ctx, `UPDATE plan_versions SET revision = revision + 1, updated_by = $2, updated_at = now() WHERE id = $1
			RETURNING plan_id, version, revision`, versionID, actorID(actor)).Scan(&planID, &version, &rev); err != nil {
			return err
		}
		if _, err := tx.Exec(ctx, `UPDATE plans SET updated_at = now() WHERE id = $1`, planID); err != nil {
			return err
		}
		return AuditTx(ctx, tx, actor, "update", "plan", planID, map[string]any{"version": version, "revision": rev,
			"set_aside_food_choices_removed": removed})
	})
	return removed, err
}
