package server

import (
	"bytes"
	"context"
	"crypto/sha256"
	"fmt"
	"maps"
	"slices"
	"sync/atomic"

	lru "github.com/hashicorp/golang-lru/v2"

	"larder/internal/forms"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// Rendering a plan's body — every day, every feed with its suggestion and
// checks, the charts, the notes — is most of a plan page's CPU, yet it
// changes only when what it is made of does. So the rendered body is kept
// under a hash of everything it reads (planDetailKey): the version's
// content named by its id and revision (a published version is frozen by a
// trigger; a draft's revision moves with any change of its content), the
// stored food suggestions and the dietitian's food choices as read for this
// view, the foods list those choices are checked against, the client's name,
// mass unit, cautions and dietary needs, the form's values and the ids in
// the links. Anything changed gives a new key, never a stale page; the
// status, the versions list, the body-mass age and everything else above the
// body is built anew for every view (planHead).

// Bounds of the kept bodies: the demo's largest plan renders to some tens
// of KB, so the byte bound is the one that holds in practice.
const (
	planDetailCacheSize  = 256
	planDetailCacheBytes = 16 << 20
)

// planDetail is a rendered body with the plan's own findings, which the
// head shows but only the body's building can sort out (the findings with
// no place in the body go there). Shared between requests: read only.
type planDetail struct {
	html     []byte
	findings []web.FindingView
}

type planDetailCache struct {
	lru   *lru.Cache[[sha256.Size]byte, *planDetail]
	bytes atomic.Int64
	limit int64
}

func newPlanDetailCache(limit int64) *planDetailCache {
	c := &planDetailCache{limit: limit}
	l, err := lru.NewWithEvict(planDetailCacheSize, func(_ [sha256.Size]byte, d *planDetail) {
		c.bytes.Add(-int64(len(d.html)))
	})
	if err != nil {
		panic(err) // only for a size below 1
	}
	c.lru = l
	return c
}

func (c *planDetailCache) get(k [sha256.Size]byte) (*planDetail, bool) { return c.lru.Get(k) }

// add keeps d, dropping the least recently used bodies while the kept
// bytes are over the limit. A body larger than the limit is not kept.
func (c *planDetailCache) add(k [sha256.Size]byte, d *planDetail) {
	if int64(len(d.html)) > c.limit {
		return
	}
	if c.lru.Contains(k) {
		return
	}
	c.bytes.Add(int64(len(d.html)))
	c.lru.Add(k, d)
	for c.bytes.Load() > c.limit {
		if _, _, ok := c.lru.RemoveOldest(); !ok {
			break
		}
	}
}

// detailInputs is everything planDetailView, placeFoodChoices and
// PlanDetail read, besides the version's content (named by v's id and
// revision).
type detailInputs struct {
	c       store.Client
	p       store.Plan
	v       store.PlanVersion
	needs   store.DietaryNeeds
	stored  map[string]string
	choices map[string][]menu.ChoiceLine
	byID    map[int64]menu.Food // the active foods, read only when there are choices
	form    forms.Form
}

// planDetailKey hashes in. ok is false when the body must not be kept: a
// form with errors, or one answering a refused save (notice), shows what
// was typed once and is not worth keeping.
func planDetailKey(in detailInputs, notice string) (key [sha256.Size]byte, ok bool) {
	if notice != "" || in.form.Has() {
		return key, false
	}
	k := newChartKey("plan detail")
	ids := func(xs ...int64) {
		for _, x := range xs {
			k.str(fmt.Sprint(x))
		}
	}
	ids(in.c.ID, in.p.ID, in.v.ID, int64(in.v.Version), int64(in.v.Revision))
	k.str(in.v.Status)
	k.str(in.c.Name)
	k.str(string(in.c.Unit))
	k.str(in.c.Cautions)
	k.str(fmt.Sprint(in.needs.Confirmed()))
	k.str(fmt.Sprintf("%q", in.needs.Codes))
	k.str("suggestions")
	for _, name := range slices.Sorted(maps.Keys(in.stored)) {
		k.str(name)
		k.str(in.stored[name])
	}
	k.str("choices")
	for _, name := range slices.Sorted(maps.Keys(in.choices)) {
		k.str(name)
		k.str(fmt.Sprintf("%#v", in.choices[name]))
	}
	k.str("foods")
	for _, id := range slices.Sorted(maps.Keys(in.byID)) {
		k.str(fmt.Sprintf("%#v", in.byID[id]))
	}
	k.str("form")
	for _, name := range slices.Sorted(maps.Keys(in.form.Values)) {
		k.str(name)
		k.str(fmt.Sprintf("%q", in.form.Values[name]))
	}
	k.h.Sum(key[:0])
	return key, true
}

// renderDetail sets pv.Detail and pv.PlanFindings: from the cache when the
// same body was rendered before, else built and rendered now (and kept when
// planDetailKey allows). pv must already hold what the head sets that the
// body reads too (Form, Theirs, Editable, SuggestionNote, ClientName).
func (s *Server) renderDetail(ctx context.Context, pv *web.PlanView, in detailInputs, notice string) error {
	key, keep := planDetailKey(in, notice)
	if keep {
		if d, ok := s.details.get(key); ok {
			pv.Detail, pv.PlanFindings = d.html, d.findings
			return nil
		}
	}
	opts := menu.OptionsForClient(in.c.Cautions, in.needs.Codes, in.needs.Confirmed())
	s.planDetailView(pv, in.c, in.p, in.v, in.stored)
	placeFoodChoices(pv, in.c, in.p, in.v, in.choices, in.byID, opts)
	var buf bytes.Buffer
	if err := web.PlanDetail(*pv).Render(ctx, &buf); err != nil {
		return err
	}
	pv.Detail = buf.Bytes()
	if keep {
		s.details.add(key, &planDetail{html: pv.Detail, findings: pv.PlanFindings})
	}
	return nil
}
