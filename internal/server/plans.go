package server

import (
	"errors"
	"fmt"
	"net/http"
	"slices"
	"strconv"

	"larder/internal/mass"

	"github.com/go-chi/chi/v5"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// Plan pages: start a plan from a client (prefilled from the records), show a
// version with its findings beside each figure, take a dietitian's overrides,
// save the draft under a revision check, publish, revise, list versions.

func (s *Server) mountPlanPages(r chi.Router) {
	r.Get("/assets/plans.css", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "text/css; charset=utf-8")
		w.Header().Set("Cache-Control", "max-age=300")
		_, _ = w.Write(web.PlanCSS)
	})
	r.Get("/assets/plans.js", func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Content-Type", "text/javascript; charset=utf-8")
		w.Header().Set("Cache-Control", "max-age=300")
		_, _ = w.Write(web.PlanJS)
	})
	r.Get("/clients/{clientID}/plans/new", s.newPlanPage)
	r.Post("/clients/{clientID}/plans", s.createPlan)
	r.With(s.recordRead(store.ReadPlan)).Get("/clients/{clientID}/plans/{planID}", s.showPlan)
	r.With(s.recordRead(store.ReadPlan)).Get("/clients/{clientID}/plans/{planID}/versions/{version}", s.showPlanVersion)
	r.Post("/clients/{clientID}/plans/{planID}/versions/{version}", s.editPlanVersion)
	r.Post("/clients/{clientID}/plans/{planID}/revise", s.revisePlan)
	r.Post("/clients/{clientID}/plans/{planID}/versions/{version}/discard", s.discardDraft)
}

var planKinds = []web.Option{
	{Value: fuel.KindLoading, Label: "Carbohydrate loading before an event"},
	{Value: fuel.KindRace, Label: "Race day: pre-event meal and in-event fuelling"},
	{Value: fuel.KindRepletion, Label: "Repletion between two sessions"},
	{Value: fuel.KindWeek, Label: "Training week: daily targets by training load"},
}

var planProtocols = []web.Option{
	{Value: fuel.ProtocolTwoDay, Label: "Two-day (36–48 h at 10–12 g/kg)"},
	{Value: fuel.ProtocolOneDay, Label: "One-day (about 10 g/kg in 24 h)"},
	{Value: fuel.ProtocolThreeDay, Label: "Three-day with taper"},
}

func kindLabel(kind string) string {
	switch kind {
	case fuel.KindLoading:
		return "Carbohydrate loading"
	case fuel.KindRace:
		return "Race day"
	case fuel.KindRepletion:
		return "Repletion"
	case fuel.KindWeek:
		return "Training week"
	}
	return kind
}

// ----- showing a plan -----

func (s *Server) planFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.Plan, bool) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return c, store.Plan{}, false
	}
	id, ok := s.ParamID(w, r, "planID")
	if !ok {
		return c, store.Plan{}, false
	}
	p, err := s.Store.PlanByID(r.Context(), c.ID, id)
	if err != nil {
		s.StoreError(w, r, err)
		return c, p, false
	}
	return c, p, true
}

func (s *Server) showPlan(w http.ResponseWriter, r *http.Request) {
	c, p, ok := s.planFromURL(w, r)
	if !ok {
		return
	}
	versions, err := s.Store.PlanVersions(r.Context(), p.ID)
	if err != nil || len(versions) == 0 {
		s.ServerError(w, r, fmt.Errorf("plan %d versions: %v", p.ID, err))
		return
	}
	cur := versions[0]
	for _, v := range versions {
		if v.Status == store.PlanDraft {
			cur = v
		}
	}
	s.renderPlan(w, r, http.StatusOK, c, p, cur, versions, versionValues(cur, c.Unit), "")
}

func (s *Server) versionFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.Plan, store.PlanVersion, []store.PlanVersion, bool) {
	c, p, ok := s.planFromURL(w, r)
	if !ok {
		return c, p, store.PlanVersion{}, nil, false
	}
	n, err := strconv.Atoi(chi.URLParam(r, "version"))
	if err != nil || n < 1 {
		s.NotFound(w, r)
		return c, p, store.PlanVersion{}, nil, false
	}
	versions, err := s.Store.PlanVersions(r.Context(), p.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return c, p, store.PlanVersion{}, nil, false
	}
	for _, v := range versions {
		if v.Version == n {
			return c, p, v, versions, true
		}
	}
	s.NotFound(w, r)
	return c, p, store.PlanVersion{}, nil, false
}

// showPlanVersion shows one version of a plan. What versionFromURL and
// renderPlan read one after another is read here in one round trip; a
// frozen version's content and food suggestions come from the cache.
func (s *Server) showPlanVersion(w http.ResponseWriter, r *http.Request) {
	clientID, ok := s.ParamID(w, r, "clientID")
	if !ok {
		return
	}
	planID, ok := s.ParamID(w, r, "planID")
	if !ok {
		return
	}
	n, err := strconv.Atoi(chi.URLParam(r, "version"))
	if err != nil || n < 1 {
		s.NotFound(w, r)
		return
	}
	var (
		rd       store.Reads
		c        store.Client
		p        store.Plan
		versions []store.PlanVersion
		needs    store.DietaryNeeds
		stored   map[string]string
		choices  map[string][]menu.ChoiceLine
	)
	rd.Client(clientID, &c)
	rd.Plan(clientID, planID, &p)
	rd.PlanVersions(planID, &versions)
	rd.DietaryNeeds(clientID, &needs)
	rd.DraftSuggestions(planID, n, &stored)
	rd.FeedChoices(planID, n, &choices)
	if err := s.Store.Read(r.Context(), &rd); err != nil {
		s.StoreError(w, r, err)
		return
	}
	i := slices.IndexFunc(versions, func(v store.PlanVersion) bool { return v.Version == n })
	if i < 0 {
		s.NotFound(w, r)
		return
	}
	v := versions[i]
	if v.Status != store.PlanDraft {
		if stored, err = s.Store.FeedSuggestions(r.Context(), v.ID); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	s.renderPlanWith(w, r, http.StatusOK, c, p, v, versions, versionValues(v, c.Unit), "", planReads{stored: stored, needs: needs, choices: choices})
}

func (s *Server) renderPlan(w http.ResponseWriter, r *http.Request, status int, c store.Client, p store.Plan, v store.PlanVersion,
	versions []store.PlanVersion, f forms.Form, notice string) {
	stored, err := s.Store.FeedSuggestions(r.Context(), v.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	needs, err := s.Store.ClientDietaryNeeds(r.Context(), c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	choices, err := s.Store.FeedChoices(r.Context(), v.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.renderPlanWith(w, r, status, c, p, v, versions, f, notice, planReads{stored: stored, needs: needs, choices: choices})
}

// planReads is what a plan page shows beside the version itself: the food
// plan of each feed, the client's dietary needs and the dietitian's food
// choices.
type planReads struct {
	stored  map[string]string
	needs   store.DietaryNeeds
	choices map[string][]menu.ChoiceLine
}

// renderPlanWith is renderPlan with what it reads already read. The
// plan's body comes rendered from the cache when nothing it reads has
// changed (renderDetail).
func (s *Server) renderPlanWith(w http.ResponseWriter, r *http.Request, status int, c store.Client, p store.Plan, v store.PlanVersion,
	versions []store.PlanVersion, f forms.Form, notice string, pr planReads) {
	var byID map[int64]menu.Food
	if len(pr.choices) > 0 {
		var err error
		if _, byID, err = s.foodsByID(r.Context()); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	opts := menu.OptionsForClient(c.Cautions, pr.needs.Codes, pr.needs.Confirmed())
	pv := s.planHead(c, p, v, versions)
	if pv.SetAside = setAsideChoices(v, pr.choices); len(pv.SetAside) > 0 && v.Status == store.PlanDraft {
		pv.SetAsideURL = pv.ActionURL + "/set-aside-choices"
	}
	pv.SuggestionNote = opts.Note()
	pv.Form = f
	pv.MassUnit = mass.Or(mass.Unit(f.Get(massUnitName)), c.Unit)
	pv.Notice = notice
	if !pv.Editable && notice != "" {
		pv.Carry = carriedValues(f)
	}
	if pv.Editable && notice != "" {
		pv.Theirs = differing(f, versionValues(v, c.Unit))
	}
	in := detailInputs{c: c, p: p, v: v, needs: pr.needs, stored: pr.stored, choices: pr.choices, byID: byID, form: f}
	if err := s.renderDetail(r.Context(), &pv, in, notice); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, status, p.Title, "clients", web.PlanPage(pv))
}

func (s *Server) revisePlan(w http.ResponseWriter, r *http.Request) {
	c, p, ok := s.planFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	pub, err := s.Store.PublishedPlanVersion(r.Context(), p.ID)
	if err != nil {
		s.StoreError(w, r, err)
		return
	}
	// The new draft's food suggestions are made afresh from today's foods
	// list (a food archived since is no longer offered), once, here.
	fresh, err := s.planSuggestions(r.Context(), c, pub.Result)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	v, err := s.Store.NewVersionWith(r.Context(), Actor(r), p.ID, pub.ID, fresh)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	msg := "Version " + strconv.Itoa(v.Version) + " started as a draft copy of version " + strconv.Itoa(pub.Version) + "."
	if v.Version != pub.Version+1 || v.Revision != 1 {
		msg = "This plan already has a draft (version " + strconv.Itoa(v.Version) + "); it is opened instead."
	}
	// Values carried over from a refused edit of a published version are
	// applied to the new draft, so that nothing typed is lost.
	if values := overrideInputs(r.PostForm); len(values) > 0 {
		req, f := decodeOverrides(values, v.Request)
		plan, cerr := fuel.Compute(req)
		var notes *store.PlanNotes
		if cerr == nil {
			notes = decodeNotes(values, plan, &f)
		}
		if f.Has() || cerr != nil {
			versions, err := s.Store.PlanVersions(r.Context(), p.ID)
			if err != nil {
				s.ServerError(w, r, err)
				return
			}
			s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, msg+" Your values were not applied: correct the boxes marked below and save.")
			return
		}
		sugg, err := s.planSuggestions(r.Context(), c, plan)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		content := store.PlanContent{Request: req, Result: plan, BodyMassKg: v.BodyMassKg, BodyMassOn: v.BodyMassOn,
			Suggestions: sugg, Notes: notes}
		if _, err := s.Store.SaveDraft(r.Context(), Actor(r), v.ID, v.Revision, content); err != nil {
			if errors.Is(err, store.ErrStaleRevision) || errors.Is(err, store.ErrNotDraft) {
				s.conflict(w, r, c, p, v, f, err)
				return
			}
			s.ServerError(w, r, err)
			return
		}
		msg += " Your values were applied and checked."
	}
	s.Flash(r, msg)
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version))
}

func (s *Server) discardDraft(w http.ResponseWriter, r *http.Request) {
	c, p, v, versions, ok := s.versionFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	revision, ok := formRevision(w, r)
	if !ok {
		return
	}
	gone, err := s.Store.DiscardDraft(r.Context(), Actor(r), v.ID, revision)
	switch {
	case errors.Is(err, store.ErrStaleRevision):
		s.renderPlan(w, r, http.StatusConflict, c, p, v, versions, versionValues(v, c.Unit),
			"Not discarded: someone saved this draft after you opened it. Look at their changes before discarding it.")
		return
	case errors.Is(err, store.ErrNotDraft):
		s.renderPlan(w, r, http.StatusConflict, c, p, v, versions, versionValues(v, c.Unit),
			"Not discarded: this version is no longer a draft. Published versions are kept.")
		return
	case err != nil:
		s.ServerError(w, r, err)
		return
	}
	if gone {
		s.Flash(r, "Draft discarded; the plan had no other version, so it is gone.")
		Redirect(w, r, web.Path("clients", c.ID))
		return
	}
	s.Flash(r, "Draft version "+strconv.Itoa(v.Version)+" discarded. Earlier versions are unchanged.")
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID))
}

// formRevision reads the draft revision a posted plan form was made from; a
// form without one gets a 400 and false.
func formRevision(w http.ResponseWriter, r *http.Request) (int, bool) {
	revision, err := strconv.Atoi(r.PostForm.Get("revision"))
	if err != nil {
		http.Error(w, "The form is missing its revision; reload the page.", http.StatusBadRequest)
		return 0, false
	}
	return revision, true
}
