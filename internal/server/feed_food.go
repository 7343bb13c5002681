package server

import (
	"context"
	"errors"
	"fmt"
	"math"
	"net/http"
	"net/url"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/go-chi/chi/v5"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// The dietitian decides a feed's food: on a draft, any feed's suggestion can
// be replaced by foods of the foods list in grams and free lines in the
// dietitian's words. The lines are kept with the version (and copied into
// new versions), checked against the feed's carbohydrate and the client's
// dietary needs, and shown in the suggestion's place everywhere.

func (s *Server) mountFeedFoodRoutes(r chi.Router) {
	const path = "/clients/{clientID}/plans/{planID}/versions/{version}/feeds/{kind}/{date}/{index}/food"
	r.With(s.recordRead(store.ReadPlan)).Get(path, s.feedFoodPage)
	r.Post(path, s.saveFeedFood)
}

// feedRef is one feed of a plan, named as menu.FeedKey names it.
type feedRef struct {
	kind, date     string
	index          int
	at             time.Time
	label          string
	choG, proteinG float64
}

func (f feedRef) key() string { return menu.FeedKey(f.kind, f.date, f.index) }

// findFeed finds a feed of a plan by its key's parts.
func findFeed(plan fuel.Plan, kind, date string, index int) (feedRef, bool) {
	switch kind {
	case "day":
		for _, d := range plan.Days {
			if d.Date == date && index >= 0 && index < len(d.Feeds) {
				f := d.Feeds[index]
				return feedRef{kind, date, index, f.At, f.Label, f.ChoG, f.ProteinG}, true
			}
		}
	case "pre_event":
		if m := plan.PreEventMeal; m != nil && index == 0 && menu.FeedDate(plan, m.At) == date {
			return feedRef{kind, date, 0, m.At, "pre-event meal", m.ChoG, 0}, true
		}
	case "repletion":
		if rp := plan.Repletion; rp != nil && index >= 0 && index < len(rp.Feeds) && menu.FeedDate(plan, rp.Feeds[index].At) == date {
			f := rp.Feeds[index]
			return feedRef{kind, date, index, f.At, f.Label, f.ChoG, f.ProteinG}, true
		}
	}
	return feedRef{}, false
}

// foodFeed is the feed whose food a feed shows: a pre-event meal or
// repletion feed that is also a feed of a day (at the same time) has that
// day feed's food, so the choice is made there.
func foodFeed(plan fuel.Plan, f feedRef) feedRef {
	if f.kind == "day" {
		return f
	}
	for _, d := range plan.Days {
		for i, x := range d.Feeds {
			if x.At.Equal(f.at) {
				return feedRef{"day", d.Date, i, x.At, x.Label, x.ChoG, x.ProteinG}
			}
		}
	}
	return f
}

func feedFoodURL(c store.Client, p store.Plan, v store.PlanVersion, f feedRef) string {
	return web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version, "feeds", f.kind, f.date, f.index, "food")
}

// feedFromURL loads the version and the feed an address names; a feed
// shown twice is sent to the day feed whose food it shows.
func (s *Server) feedFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.Plan, store.PlanVersion, feedRef, bool) {
	c, p, v, _, ok := s.versionFromURL(w, r)
	if !ok {
		return c, p, v, feedRef{}, false
	}
	index, err := strconv.Atoi(chi.URLParam(r, "index"))
	f, found := feedRef{}, false
	if err == nil {
		f, found = findFeed(v.Result, chi.URLParam(r, "kind"), chi.URLParam(r, "date"), index)
	}
	if !found {
		s.NotFound(w, r)
		return c, p, v, f, false
	}
	if d := foodFeed(v.Result, f); d != f {
		http.Redirect(w, r, feedFoodURL(c, p, v, d), http.StatusSeeOther)
		return c, p, v, f, false
	}
	if v.Status != store.PlanDraft {
		s.Flash(r, "Version "+strconv.Itoa(v.Version)+" is "+v.Status+" and cannot change: start a new version to change a feed’s food.")
		Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version))
		return c, p, v, f, false
	}
	return c, p, v, f, true
}

// Inputs of the food-choice form.
func choiceFoodName(i int) string  { return fmt.Sprintf("food_%d", i) }
func choiceGramsName(i int) string { return fmt.Sprintf("grams_%d", i) }
func choiceTextName(i int) string  { return fmt.Sprintf("free_%d", i) }
func choiceChoName(i int) string   { return fmt.Sprintf("freecho_%d", i) }
func choiceProtName(i int) string  { return fmt.Sprintf("freeprot_%d", i) }

// choiceValues fills the form with saved lines, or else with the foods of
// the suggestion (when the suggestion made now is the one stored), so that
// swapping one food is changing one box.
func choiceValues(lines []menu.ChoiceLine, sugg menu.Suggestion, stored string) url.Values {
	v := url.Values{}
	if len(lines) == 0 && len(sugg.Items) > 0 && sugg.Text() == stored {
		for _, it := range sugg.Items {
			lines = append(lines, menu.ChoiceLine{FoodID: it.Food.ID, Grams: menu.AsEaten(it.Food, it.Grams)})
		}
	}
	nf, nt := 0, 0
	for _, l := range lines {
		switch {
		case l.Free && nt < menu.MaxChoiceFree:
			v.Set(choiceTextName(nt), l.Name)
			v.Set(choiceChoName(nt), strconv.FormatFloat(l.ChoG, 'f', -1, 64))
			if l.ProteinG > 0 {
				v.Set(choiceProtName(nt), strconv.FormatFloat(l.ProteinG, 'f', -1, 64))
			}
			nt++
		case !l.Free && nf < menu.MaxChoiceLines:
			if l.FoodID != 0 {
				v.Set(choiceFoodName(nf), strconv.FormatInt(l.FoodID, 10))
			}
			v.Set(choiceGramsName(nf), strconv.FormatFloat(l.Grams, 'f', -1, 64))
			nf++
		}
	}
	return v
}

// decimal reads a typed number; a comma is taken as the decimal mark.
func decimal(raw string) (float64, bool) {
	x, err := strconv.ParseFloat(strings.ReplaceAll(strings.TrimSpace(raw), ",", "."), 64)
	return x, err == nil && !math.IsNaN(x) && !math.IsInf(x, 0)
}

// decodeChoice reads the food-choice form into lines; the lines are ready
// to save only when the form has no errors. byID holds the foods that may
// be chosen (the active foods list).
func decodeChoice(values url.Values, byID map[int64]menu.Food) ([]menu.ChoiceLine, forms.Form) {
	f := forms.FromValues(values)
	var lines []menu.ChoiceLine
	for i := range menu.MaxChoiceLines {
		foodRaw, gramsRaw := strings.TrimSpace(values.Get(choiceFoodName(i))), strings.TrimSpace(values.Get(choiceGramsName(i)))
		if foodRaw == "" && gramsRaw == "" {
			continue
		}
		var food menu.Food
		okFood := false
		if foodRaw == "" {
			f.Errors.Add(choiceFoodName(i), "Choose the food for this amount, or clear the amount.")
		} else if id, err := strconv.ParseInt(foodRaw, 10, 64); err != nil {
			f.Errors.Add(choiceFoodName(i), "Choose a food from the list.")
		} else if food, okFood = byID[id]; !okFood {
			f.Errors.Add(choiceFoodName(i), "This food is not in the foods list (it may have been archived): choose another.")
		}
		grams, okGrams := decimal(gramsRaw)
		switch {
		case gramsRaw == "":
			f.Errors.Add(choiceGramsName(i), "Give the amount in grams.")
			okGrams = false
		case !okGrams:
			f.Errors.Add(choiceGramsName(i), "Give the amount as a number of grams, for example 150.")
		case grams <= 0:
			f.Errors.Add(choiceGramsName(i), "The amount must be more than 0 g.")
			okGrams = false
		case grams > menu.MaxChoiceGrams:
			f.Errors.Add(choiceGramsName(i), fmt.Sprintf("At most %d g of one food in a feed: check the amount.", menu.MaxChoiceGrams))
			okGrams = false
		}
		if okFood && okGrams {
			lines = append(lines, menu.FoodLine(food, math.Round(grams*10)/10))
		}
	}
	for i := range menu.MaxChoiceFree {
		text, choRaw := strings.TrimSpace(values.Get(choiceTextName(i))), strings.TrimSpace(values.Get(choiceChoName(i)))
		if text == "" && choRaw == "" {
			continue
		}
		okText := true
		switch {
		case text == "":
			f.Errors.Add(choiceTextName(i), "Write what to eat, or clear the carbohydrate.")
			okText = false
		case len([]rune(text)) > menu.MaxChoiceTextLen:
			f.Errors.Add(choiceTextName(i), fmt.Sprintf("At most %d characters.", menu.MaxChoiceTextLen))
			okText = false
		}
		cho, okCho := decimal(choRaw)
		switch {
		case choRaw == "":
			f.Errors.Add(choiceChoName(i), "Give the carbohydrate of this line in grams, so the feed can be checked.")
			okCho = false
		case !okCho:
			f.Errors.Add(choiceChoName(i), "Give the carbohydrate as a number of grams, for example 45.")
		case cho < 0:
			f.Errors.Add(choiceChoName(i), "The carbohydrate cannot be below 0 g.")
			okCho = false
		case cho > menu.MaxChoiceChoG:
			f.Errors.Add(choiceChoName(i), fmt.Sprintf("At most %d g of carbohydrate on one line: check the figure.", menu.MaxChoiceChoG))
			okCho = false
		}
		// The protein is optional: without it the line counts as 0 g of
		// protein, which the checks say.
		protRaw := strings.TrimSpace(values.Get(choiceProtName(i)))
		prot, okProt := 0.0, true
		if protRaw != "" {
			prot, okProt = decimal(protRaw)
			switch {
			case !okProt:
				f.Errors.Add(choiceProtName(i), "Give the protein as a number of grams, for example 20, or leave it empty.")
			case prot < 0:
				f.Errors.Add(choiceProtName(i), "The protein cannot be below 0 g.")
				okProt = false
			case prot > menu.MaxChoiceProteinG:
				f.Errors.Add(choiceProtName(i), fmt.Sprintf("At most %d g of protein on one line: check the figure.", menu.MaxChoiceProteinG))
				okProt = false
			}
		}
		if okText && okCho && okProt {
			lines = append(lines, menu.ChoiceLine{Free: true, Name: text, ChoG: math.Round(cho*10) / 10, ProteinG: math.Round(prot*10) / 10})
		}
	}
	if len(lines) == 0 && !f.Has() {
		f.Errors.Add("lines", "Choose at least one food or write a line. To go back to the suggestion, use “Use the suggestion again”.")
	}
	return lines, f
}

// choiceNeeds are the need codes a choice is checked against: the
// client's, as the suggestions keep to them.
func choiceNeeds(opts menu.Options) []string {
	codes := slices.Clone(opts.Needs)
	if opts.GlutenFree && !slices.Contains(codes, "gluten_free") {
		codes = append(codes, "gluten_free")
	}
	return codes
}

// choiceChecks are a saved choice's checks as findings.
func choiceChecks(lines []menu.ChoiceLine, f feedRef, byID map[int64]menu.Food, opts menu.Options) []web.FindingView {
	var out []web.FindingView
	// An in-event feed is carbohydrate only: its protein is not checked.
	protein := f.proteinG
	if strings.Contains(f.label, "during") {
		protein = 0
	}
	for _, c := range menu.CheckChoice(lines, f.choG, protein, byID, choiceNeeds(opts)) {
		out = append(out, web.FindingView{Level: c.Level, Symbol: web.LevelSymbol(c.Level), Word: web.LevelWord(c.Level),
			Message: c.Message, Code: "food_choice",
			Source: "margins: carbohydrate ±10 % or ±5 g, protein ±20 % or ±5 g, whichever is larger (this project’s own, as for suggestions)"})
	}
	return out
}

// foodsByID gives the active foods list by id.
func (s *Server) foodsByID(ctx context.Context) ([]menu.Food, map[int64]menu.Food, error) {
	list, err := s.Store.ListFoods(ctx, false)
	if err != nil {
		return nil, nil, err
	}
	foods := MenuFoods(list)
	byID := make(map[int64]menu.Food, len(foods))
	for _, f := range foods {
		byID[f.ID] = f
	}
	return foods, byID, nil
}

func (s *Server) feedFoodPage(w http.ResponseWriter, r *http.Request) {
	c, p, v, f, ok := s.feedFromURL(w, r)
	if !ok {
		return
	}
	s.renderFeedFood(w, r, http.StatusOK, c, p, v, f, nil, "")
}

// renderFeedFood shows the page; form nil fills it from what is saved.
func (s *Server) renderFeedFood(w http.ResponseWriter, r *http.Request, status int, c store.Client, p store.Plan, v store.PlanVersion,
	f feedRef, form *forms.Form, notice string) {
	ctx := r.Context()
	foods, byID, err := s.foodsByID(ctx)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	opts, err := s.menuOptions(ctx, c)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	choices, err := s.Store.FeedChoices(ctx, v.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	computed, err := s.Store.ComputedSuggestions(ctx, v.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	lines := choices[f.key()]
	loc := loadZone(v.Result.TimeZone)
	fv := web.FeedFoodView{ClientID: c.ID, ClientName: c.Name, PlanTitle: p.Title,
		PlanURL:   web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version) + "#feed-" + f.key(),
		ActionURL: feedFoodURL(c, p, v, f),
		FeedLabel: f.label + ", " + f.at.In(loc).Format("Mon 2 Jan 15:04"),
		FeedChoG:  web.Num(f.choG, 0), FeedProtein: web.Num(f.proteinG, 0),
		Suggested: computed[f.key()], Chosen: len(lines) > 0, NeedsNote: opts.Note(), Notice: notice,
		Foods: []web.Option{{Value: "", Label: "— none —"}}}
	if len(lines) > 0 {
		fv.Checks = choiceChecks(lines, f, byID, opts)
	}
	for _, fd := range foods {
		fv.Foods = append(fv.Foods, web.Option{Value: strconv.FormatInt(fd.ID, 10),
			Label: foodOptionLabel(fd)})
	}
	for i := range menu.MaxChoiceLines {
		fv.FoodRows = append(fv.FoodRows, web.FeedFoodRow{N: i + 1, Food: choiceFoodName(i), Grams: choiceGramsName(i)})
	}
	for i := range menu.MaxChoiceFree {
		fv.FreeRows = append(fv.FreeRows, web.FeedFoodRow{N: i + 1, Text: choiceTextName(i), ChoGrams: choiceChoName(i), ProtGrams: choiceProtName(i)})
	}
	if form != nil {
		fv.Form = *form
	} else {
		var sugg menu.Suggestion
		if len(lines) == 0 {
			sugg = menu.PlanSuggestionsDetail(v.Result, foods, opts)[f.key()]
		}
		fv.Form = forms.FromValues(choiceValues(lines, sugg, computed[f.key()]))
	}
	fv.Form.Values.Set("revision", strconv.Itoa(v.Revision))
	s.Render(w, r, status, "Food for "+f.label, "clients", web.FeedFoodPage(fv))
}

func (s *Server) saveFeedFood(w http.ResponseWriter, r *http.Request) {
	c, p, v, f, ok := s.feedFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	revision, ok := formRevision(w, r)
	if !ok {
		return
	}
	var lines []menu.ChoiceLine
	msg := "The suggestion is back for " + f.label + "."
	if r.PostForm.Get("action") != "clear" {
		_, byID, err := s.foodsByID(r.Context())
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		var form forms.Form
		lines, form = decodeChoice(r.PostForm, byID)
		if form.Has() {
			s.renderFeedFood(w, r, http.StatusUnprocessableEntity, c, p, v, f, &form, "")
			return
		}
		msg = "Your food for " + f.label + " is saved: " + menu.ChoiceText(lines) + "."
	}
	if _, err := s.Store.SetFeedChoice(r.Context(), Actor(r), v.ID, revision, f.kind, f.date, f.index, lines); err != nil {
		switch {
		case errors.Is(err, store.ErrStaleRevision):
			// What was typed is kept; the form now carries the current
			// revision, so saving again applies it over the other change.
			form := forms.FromValues(r.PostForm)
			s.renderFeedFood(w, r, http.StatusConflict, c, p, v, f, &form,
				"Not saved: someone saved this draft after you opened this page. Your lines are kept below; look at the plan, then save again to apply them.")
		case errors.Is(err, store.ErrNotDraft):
			s.Flash(r, "Not saved: this version was published meanwhile. Start a new version to change a feed’s food.")
			Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version))
		default:
			s.StoreError(w, r, err)
		}
		return
	}
	s.Flash(r, msg)
	Redirect(w, r, web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version)+"#feed-"+f.key())
}

// placeFoodChoices adds to the plan page what belongs to the dietitian's
// food choices: on a draft, each feed's link to decide its food (a feed
// shown twice links to the day feed whose food it shows); on any version,
// the checks of each saved choice beside its feed. choices are the
// version's saved choices (Store.FeedChoices), read with the page; byID the
// active foods (foodsByID), needed only when there are choices; opts the
// client's (menuOptions).
func placeFoodChoices(pv *web.PlanView, c store.Client, p store.Plan, v store.PlanVersion,
	choices map[string][]menu.ChoiceLine, byID map[int64]menu.Food, opts menu.Options) {
	if len(choices) == 0 && v.Status != store.PlanDraft {
		return
	}
	place := func(fv *web.FeedView, f feedRef) {
		d := foodFeed(v.Result, f)
		if v.Status == store.PlanDraft {
			fv.FoodURL = feedFoodURL(c, p, v, d)
		}
		if lines := choices[d.key()]; len(lines) > 0 {
			fv.Findings = append(fv.Findings, choiceChecks(lines, d, byID, opts)...)
		}
	}
	plan := v.Result
	for di, d := range plan.Days {
		if di >= len(pv.Days) {
			break
		}
		for i := range d.Feeds {
			if i < len(pv.Days[di].Feeds) {
				f, _ := findFeed(plan, "day", d.Date, i)
				place(&pv.Days[di].Feeds[i], f)
			}
		}
	}
	if rp := plan.Repletion; rp != nil {
		for i, x := range rp.Feeds {
			if i < len(pv.RepletionFeeds) {
				f, _ := findFeed(plan, "repletion", menu.FeedDate(plan, x.At), i)
				place(&pv.RepletionFeeds[i], f)
			}
		}
	}
	if m := plan.PreEventMeal; m != nil && pv.PreEvent != nil {
		f, _ := findFeed(plan, "pre_event", menu.FeedDate(plan, m.At), 0)
		d := foodFeed(plan, f)
		if v.Status == store.PlanDraft {
			pv.PreEvent.FoodURL = feedFoodURL(c, p, v, d)
		}
		if lines := choices[d.key()]; len(lines) > 0 {
			pv.PreEvent.Findings = append(pv.PreEvent.Findings, choiceChecks(lines, d, byID, opts)...)
		}
	}
}

// foodOptionLabel tells a food in the choice form's list with what its
// amount is given in: grams, ml, or grams cooked.
func foodOptionLabel(f menu.Food) string {
	per := fmt.Sprintf("%s g carbohydrate per 100 g", web.Num(f.ChoPer100, 1))
	switch menu.UnitOf(f) {
	case menu.UnitMl:
		per = fmt.Sprintf("in ml; %s g carbohydrate per 100 ml", web.Num(f.ChoPer100, 1))
	case menu.UnitCooked:
		per = fmt.Sprintf("in g cooked; %s g carbohydrate per 100 g cooked", web.Num(f.ChoPer100/f.CookedYield, 1))
	}
	return f.Name + " — " + per + "; " + f.PortionName
}
