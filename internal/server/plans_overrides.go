package server

import (
	"errors"
	"fmt"
	"net/http"
	"net/url"
	"sort"
	"strconv"
	"strings"
	"time"

	"larder/internal/mass"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/store"
	"larder/web"
)

// Editing a draft: the dietitian's override inputs, their decoding and
// saving under a revision check, and the answer to a save that lost a race.

// ----- editing a draft -----

// Override inputs are named after the value they set:
//
//	gkg_2027-04-16        a day's carbohydrate g/kg
//	occ_2027-04-16        a day's eating occasions
//	feedcho_2027-04-16_2  the carbohydrate g of the day's third feed
//	feedat_2027-04-16_2   its time (HH:MM)
//	during_gph            the in-event g/h
//
// An empty input means "no override": the computed value stands.

func gkgName(date string) string            { return "gkg_" + date }
func occName(date string) string            { return "occ_" + date }
func feedChoName(date string, i int) string { return fmt.Sprintf("feedcho_%s_%d", date, i) }
func feedAtName(date string, i int) string  { return fmt.Sprintf("feedat_%s_%d", date, i) }

const duringName = "during_gph"

// Inputs of a draft's body figures: prefilled with the values used (not
// overrides: the plan is recomputed from them as from the start form).
// The body mass is typed in the unit named by massUnitName (the client's,
// when the page was drawn).
const (
	massName     = "in_body_mass_kg"
	massUnitName = "in_body_mass_unit"
	fatName      = "in_body_fat_pct"
)

// overrideValues fills the override inputs from a request's overrides; the
// body mass is shown in unit u.
func overrideValues(req fuel.Request, u mass.Unit) forms.Form {
	v := url.Values{}
	for _, o := range req.Overrides {
		if o.ChoGPerKg != nil {
			v.Set(gkgName(o.Date), web.Num(*o.ChoGPerKg, 2))
		}
		if o.EatingOccasions != nil {
			v.Set(occName(o.Date), strconv.Itoa(*o.EatingOccasions))
		}
	}
	for _, o := range req.FeedOverrides {
		if o.ChoG != nil {
			v.Set(feedChoName(o.Date, o.Index), web.Num(*o.ChoG, 1))
		}
		if o.At != "" {
			v.Set(feedAtName(o.Date, o.Index), o.At)
		}
	}
	if req.DuringEventChoGPerH != nil {
		v.Set(duringName, web.Num(*req.DuringEventChoGPerH, 1))
	}
	stageOverrideValues(v, req)
	v.Set(massName, mass.Input(req.Athlete.BodyMassKg, u))
	v.Set(massUnitName, string(u))
	if req.Athlete.BodyFatPct != nil {
		v.Set(fatName, web.Num(*req.Athlete.BodyFatPct, 1))
	}
	return forms.FromValues(v)
}

// decodeOverrides reads the override inputs into a copy of req. Inputs are
// checked against the engine's own limits; each bad one gets its message.
func decodeOverrides(values url.Values, req fuel.Request) (fuel.Request, forms.Form) {
	f := forms.FromValues(values)
	days := map[string]*fuel.DayOverride{}
	feeds := map[string]*fuel.FeedOverride{}
	var dayOrder, feedOrder []string
	day := func(date string) *fuel.DayOverride {
		if days[date] == nil {
			days[date] = &fuel.DayOverride{Date: date}
			dayOrder = append(dayOrder, date)
		}
		return days[date]
	}
	feed := func(date string, i int) *fuel.FeedOverride {
		k := fmt.Sprintf("%s_%d", date, i)
		if feeds[k] == nil {
			feeds[k] = &fuel.FeedOverride{Date: date, Index: i}
			feedOrder = append(feedOrder, k)
		}
		return feeds[k]
	}
	number := func(name, raw string, lo, hi float64, what, unit string) (float64, bool) {
		x, err := forms.ParseNumber(raw)
		if err != nil || x < lo || x > hi {
			f.Errors.Add(name, fmt.Sprintf("%s must be a number from %s to %s %s.", what, web.Num(lo, 1), web.Num(hi, 1), unit))
			return 0, false
		}
		return x, true
	}
	names := make([]string, 0, len(values))
	for name := range values {
		names = append(names, name)
	}
	sort.Strings(names)
	req.DuringEventChoGPerH = nil
	req.StageOverrides = nil
	// The body figures change only when their inputs were sent.
	if _, sent := values[massName]; sent {
		// The mass stands unless its number was changed from the one shown,
		// so re-saving in lb does not move it by a conversion's rounding.
		u := mass.Or(mass.Unit(values.Get(massUnitName)), mass.KG)
		x, err := forms.ParseNumber(values.Get(massName))
		kg := mass.Reread(x, u, req.Athlete.BodyMassKg)
		if err != nil || !mass.InRange(kg) {
			f.Errors.Add(massName, mass.RangeMessage(u))
		} else {
			req.Athlete.BodyMassKg = kg
		}
	}
	if _, sent := values[fatName]; sent {
		if raw := strings.TrimSpace(values.Get(fatName)); raw == "" {
			req.Athlete.BodyFatPct = nil
		} else if x, ok := number(fatName, raw, 3, 60, "Body fat", "%"); ok {
			req.Athlete.BodyFatPct = &x
		}
	}
	for _, name := range names {
		raw := strings.TrimSpace(values.Get(name))
		if raw == "" {
			continue
		}
		switch {
		case decodeStageOverride(f, &req, name, raw):
		case name == duringName:
			if x, ok := number(name, raw, 0, 150, "In-event carbohydrate", "g/h"); ok {
				req.DuringEventChoGPerH = &x
			}
		case strings.HasPrefix(name, "gkg_"):
			date, ok := overrideDate(strings.TrimPrefix(name, "gkg_"))
			if !ok {
				continue
			}
			if x, ok := number(name, raw, 0, 20, "Carbohydrate on "+dayWords(date), "g/kg"); ok {
				day(date).ChoGPerKg = &x
			}
		case strings.HasPrefix(name, "occ_"):
			date, ok := overrideDate(strings.TrimPrefix(name, "occ_"))
			if !ok {
				continue
			}
			n, err := strconv.Atoi(raw)
			if err != nil || n < 1 || n > 10 {
				f.Errors.Add(name, "Eating occasions on "+dayWords(date)+" must be a whole number from 1 to 10.")
				continue
			}
			day(date).EatingOccasions = &n
		case strings.HasPrefix(name, "feedcho_"), strings.HasPrefix(name, "feedat_"):
			rest := name[strings.Index(name, "_")+1:]
			date, idx, ok := feedKey(rest)
			if !ok {
				continue
			}
			if strings.HasPrefix(name, "feedcho_") {
				if x, ok := number(name, raw, 0, 1000, "Carbohydrate of this feed", "g"); ok {
					feed(date, idx).ChoG = &x
				}
			} else {
				t, err := time.Parse("15:04", raw)
				if err != nil {
					f.Errors.Add(name, "The time of this feed must be a time of day like 07:30.")
					continue
				}
				feed(date, idx).At = t.Format("15:04")
			}
		}
	}
	req.Overrides = nil
	for _, d := range dayOrder {
		req.Overrides = append(req.Overrides, *days[d])
	}
	req.FeedOverrides = nil
	for _, k := range feedOrder {
		req.FeedOverrides = append(req.FeedOverrides, *feeds[k])
	}
	return req, f
}

func overrideDate(s string) (string, bool) {
	_, err := time.Parse(time.DateOnly, s)
	return s, err == nil
}

func feedKey(s string) (string, int, bool) {
	date, idx, ok := strings.Cut(s, "_")
	if !ok {
		return "", 0, false
	}
	if _, ok := overrideDate(date); !ok {
		return "", 0, false
	}
	i, err := strconv.Atoi(idx)
	if err != nil || i < 0 || i > 30 {
		return "", 0, false
	}
	return date, i, true
}

func dayWords(date string) string {
	t, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return date
	}
	return t.Format("Mon 2 Jan")
}

func (s *Server) editPlanVersion(w http.ResponseWriter, r *http.Request) {
	c, p, v, versions, ok := s.versionFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	action := r.PostForm.Get("action")
	revision, ok := formRevision(w, r)
	if !ok {
		return
	}
	values := overrideInputs(r.PostForm)
	req, f := decodeOverrides(values, v.Request)
	if v.Status != store.PlanDraft {
		s.renderPlan(w, r, http.StatusConflict, c, p, v, versions, f,
			"Not saved: this version is "+v.Status+" and can no longer change. Your values are listed here; start a new version to apply them.")
		return
	}
	if f.Has() {
		s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, "")
		return
	}
	plan, err := fuel.Compute(req)
	if err != nil {
		var ve fuel.ValidationError
		if errors.As(err, &ve) {
			for _, fe := range ve {
				f.Errors.Add(overrideField(fe, req), fieldWords(fe))
			}
			s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, "")
			return
		}
		s.ServerError(w, r, err)
		return
	}
	notes := decodeNotes(values, plan, &f)
	if f.Has() {
		s.renderPlan(w, r, http.StatusUnprocessableEntity, c, p, v, versions, f, "")
		return
	}
	sugg, err := s.planSuggestions(r.Context(), c, plan)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: req.Athlete.BodyMassKg, BodyMassOn: v.BodyMassOn,
		Suggestions: sugg, Notes: notes}
	if req.Athlete.BodyMassKg != v.BodyMassKg {
		// A new figure: dated when it is the latest measurement on record.
		content.BodyMassOn = nil
		if m, err := s.Store.LatestBodyMass(r.Context(), c.ID); err == nil && m.MassKg == req.Athlete.BodyMassKg {
			content.BodyMassOn = &m.MeasuredOn
		}
	}
	var saved store.PlanVersion
	if action == "publish" {
		saved, err = s.Store.Publish(r.Context(), Actor(r), v.ID, revision, content)
	} else {
		saved, err = s.Store.SaveDraft(r.Context(), Actor(r), v.ID, revision, content)
	}
	switch {
	case errors.Is(err, store.ErrStaleRevision), errors.Is(err, store.ErrNotDraft):
		s.conflict(w, r, c, p, v, f, err)
		return
	case err != nil:
		s.ServerError(w, r, err)
		return
	}
	if action == "publish" {
		s.Flash(r, "Version "+strconv.Itoa(saved.Version)+" published. It is what the client sees and the sheet prints.")
	} else {
		s.Flash(r, "Draft saved and checked again.")
	}
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", saved.Version))
}

// differing lists, for each override input, the saved value where it is not
// what the person typed ("none" where the saved version has no override).
func differing(typed, saved forms.Form) map[string]string {
	out := map[string]string{}
	seen := map[string]bool{}
	for name := range overrideInputs(typed.Values) {
		seen[name] = true
	}
	for name := range overrideInputs(saved.Values) {
		seen[name] = true
	}
	for name := range seen {
		t, s := strings.TrimSpace(typed.Get(name)), strings.TrimSpace(saved.Get(name))
		if t != s {
			if s == "" {
				s = "none (computed)"
			}
			out[name] = s
		}
	}
	return out
}

// carriedValues lists the override values a person typed, in words, for a
// version that can no longer take them.
func carriedValues(f forms.Form) []web.Carried {
	names := make([]string, 0, len(f.Values))
	for name := range overrideInputs(f.Values) {
		if strings.TrimSpace(f.Values.Get(name)) != "" {
			names = append(names, name)
		}
	}
	sort.Strings(names)
	var out []web.Carried
	for _, name := range names {
		label := name
		switch {
		case name == duringName:
			label = "In-event carbohydrate (g/h)"
		case isNoteInput(name):
			label = noteLabel(name)
		case name == massName:
			label = "Body mass (" + string(mass.Or(mass.Unit(f.Values.Get(massUnitName)), mass.KG)) + ")"
		case name == massUnitName:
			label = "Unit of the body mass"
		case name == fatName:
			label = "Body fat (%)"
		case strings.HasPrefix(name, stageGPHPrefix):
			if i, err := strconv.Atoi(strings.TrimPrefix(name, stageGPHPrefix)); err == nil {
				label = fmt.Sprintf("In-stage carbohydrate of stage %d (g/h)", i+1)
			}
		case strings.HasPrefix(name, "gkg_"):
			label = "Carbohydrate on " + dayWords(strings.TrimPrefix(name, "gkg_")) + " (g/kg)"
		case strings.HasPrefix(name, "occ_"):
			label = "Eating occasions on " + dayWords(strings.TrimPrefix(name, "occ_"))
		case strings.HasPrefix(name, "feedcho_"), strings.HasPrefix(name, "feedat_"):
			if date, i, ok := feedKey(name[strings.Index(name, "_")+1:]); ok {
				what := "Carbohydrate (g)"
				if strings.HasPrefix(name, "feedat_") {
					what = "Time"
				}
				label = fmt.Sprintf("%s of feed %d on %s", what, i+1, dayWords(date))
			}
		}
		out = append(out, web.Carried{Name: name, Label: label, Value: f.Values.Get(name)})
	}
	return out
}

// overrideInputs keeps only the override inputs of a posted form.
func overrideInputs(form url.Values) url.Values {
	v := url.Values{}
	for name, vals := range form {
		if name == duringName || name == massName || name == massUnitName || name == fatName || isNoteInput(name) || strings.HasPrefix(name, "gkg_") || strings.HasPrefix(name, "occ_") || strings.HasPrefix(name, stageGPHPrefix) ||
			strings.HasPrefix(name, "feedcho_") || strings.HasPrefix(name, "feedat_") {
			v[name] = vals
		}
	}
	return v
}

// overrideField names the input an engine error on an override concerns.
func overrideField(fe fuel.FieldError, req fuel.Request) string {
	var i int
	var rest string
	if n, _ := fmt.Sscanf(fe.Field, "overrides[%d].%s", &i, &rest); n == 2 && i < len(req.Overrides) {
		if strings.HasPrefix(rest, "eating") {
			return occName(req.Overrides[i].Date)
		}
		return gkgName(req.Overrides[i].Date)
	}
	if n, _ := fmt.Sscanf(fe.Field, "feed_overrides[%d].%s", &i, &rest); n == 2 && i < len(req.FeedOverrides) {
		o := req.FeedOverrides[i]
		if strings.HasPrefix(rest, "at") {
			return feedAtName(o.Date, o.Index)
		}
		return feedChoName(o.Date, o.Index)
	}
	if fe.Field == "during_event_cho_g_per_h" {
		return duringName
	}
	if n, _ := fmt.Sscanf(fe.Field, "stage_overrides[%d].%s", &i, &rest); n == 2 && i < len(req.StageOverrides) {
		return stageGPHName(req.StageOverrides[i].Stage)
	}
	return "general"
}

// conflict answers a save that lost the race: nothing was written; the
// page shows the version as it now stands, with the user's own values still
// in the inputs (so nothing is lost) and the latest revision to save against.
func (s *Server) conflict(w http.ResponseWriter, r *http.Request, c store.Client, p store.Plan, mine store.PlanVersion, f forms.Form, cause error) {
	versions, err := s.Store.PlanVersions(r.Context(), p.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	latest := mine
	for _, v := range versions {
		if v.ID == mine.ID {
			latest = v
		}
	}
	who := latest.UpdatedByName
	if who == "" {
		who = "someone else"
	}
	when := latest.UpdatedAt.In(loadZone(latest.Result.TimeZone)).Format("15:04 on Mon 2 Jan")
	msg := fmt.Sprintf("Not saved: %s saved this draft at %s, after you opened it. The figures below are theirs; your own values are still in the boxes. Check them against the new figures and save again.", who, when)
	if errors.Is(cause, store.ErrNotDraft) {
		msg = fmt.Sprintf("Not saved: this version was published meanwhile (by %s at %s). Your values are listed here; start a new version to apply them.", who, when)
	}
	s.renderPlan(w, r, http.StatusConflict, c, p, latest, versions, f, msg)
}
