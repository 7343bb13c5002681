package server

import (
	"errors"
	"net/http"
	"net/url"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/go-chi/chi/v5"

	"larder/internal/forms"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// mountDietaryRoutes adds the dietary-needs form of a client.
func (s *Server) mountDietaryRoutes(r chi.Router) {
	r.Get("/clients/{clientID}/dietary-needs", s.dietaryNeedsPage)
	r.Post("/clients/{clientID}/dietary-needs", s.saveDietaryNeeds)
}

// maxNeedsOther is the longest free-text line of dietary needs (the
// column's limit).
const maxNeedsOther = 1000

// clientNeedsSection is the dietary-needs box of the client page: the
// recorded needs, and an offer to record those the cautions seem to name.
func clientNeedsSection(c store.Client, d store.DietaryNeeds) web.ClientNeedsView {
	v := web.ClientNeedsView{ClientID: c.ID, Recorded: menu.NeedLabels(d.Codes), Other: d.Other, Confirmed: d.Confirmed(),
		OfferURL: web.Path("clients", c.ID, "dietary-needs") + "?offer=1"}
	for _, m := range menu.NeedsIn(c.Cautions) {
		if !slices.Contains(d.Codes, m.Need.Code) {
			v.Offers = append(v.Offers, web.NeedOffer{Label: m.Need.Label, Phrase: m.Phrase})
		}
	}
	return v
}

func needChoices() []web.NeedChoice {
	out := make([]web.NeedChoice, len(menu.Needs))
	for i, n := range menu.Needs {
		out[i] = web.NeedChoice{Code: n.Code, Label: n.Label}
	}
	return out
}

// needsValues fills the form from recorded needs.
func needsValues(d store.DietaryNeeds, codes []string) url.Values {
	v := url.Values{}
	v.Set("revision", strconv.Itoa(d.Revision))
	v.Set("other", d.Other)
	for _, c := range codes {
		v.Set(web.NeedInput(c), "on")
	}
	return v
}

func (s *Server) dietaryNeedsPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	d, err := s.Store.ClientDietaryNeeds(r.Context(), c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	codes := slices.Clone(d.Codes)
	offered := r.URL.Query().Get("offer") == "1"
	if offered {
		for _, m := range menu.NeedsIn(c.Cautions) {
			if !slices.Contains(codes, m.Need.Code) {
				codes = append(codes, m.Need.Code)
			}
		}
	}
	s.Render(w, r, http.StatusOK, "Dietary needs · "+c.Name, "clients", web.DietaryNeedsPage(web.DietaryNeedsForm{
		ClientID: c.ID, ClientName: c.Name, Choices: needChoices(), Form: forms.FromValues(needsValues(d, codes)), Offered: offered}))
}

// decodeNeeds reads the dietary-needs form: the ticked boxes, the free
// line and the revision the form was opened at.
func decodeNeeds(values url.Values) (store.DietaryNeeds, forms.Form) {
	f := forms.FromValues(values)
	var d store.DietaryNeeds
	for key, vals := range values {
		code, isNeed := strings.CutPrefix(key, "need_")
		if !isNeed || len(vals) == 0 || vals[0] != "on" {
			continue
		}
		if _, known := menu.NeedByCode(code); !known {
			f.Errors.Add("needs", "“"+code+"” is not a dietary need this form knows; reload the page and tick the boxes again.")
			continue
		}
		d.Codes = append(d.Codes, code)
	}
	// The form's order, whatever the order of the request.
	slices.SortFunc(d.Codes, func(a, b string) int {
		return slices.IndexFunc(menu.Needs, func(n menu.DietaryNeed) bool { return n.Code == a }) -
			slices.IndexFunc(menu.Needs, func(n menu.DietaryNeed) bool { return n.Code == b })
	})
	d.Other = strings.TrimSpace(values.Get("other"))
	switch {
	case !utf8.ValidString(d.Other):
		f.Errors.Add("other", "This text could not be read; type it again.")
	case utf8.RuneCountInString(d.Other) > maxNeedsOther:
		f.Errors.Add("other", "Keep this to "+strconv.Itoa(maxNeedsOther)+" characters; it has "+strconv.Itoa(utf8.RuneCountInString(d.Other))+".")
	}
	rev, err := strconv.Atoi(values.Get("revision"))
	if err != nil || rev < 0 {
		f.Errors.Add("needs", "The form is missing its revision; reload the page and tick the boxes again.")
	}
	d.Revision = rev
	return d, f
}

func (s *Server) saveDietaryNeeds(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	d, f := decodeNeeds(r.PostForm)
	page := web.DietaryNeedsForm{ClientID: c.ID, ClientName: c.Name, Choices: needChoices(), Form: f}
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Dietary needs · "+c.Name, "clients", web.DietaryNeedsPage(page))
		return
	}
	if err := s.Store.SaveDietaryNeeds(r.Context(), Actor(r), c.ID, d.Revision, d); err != nil {
		if errors.Is(err, store.ErrStaleRevision) {
			// Keep what was ticked; the next save goes over the newer one.
			if cur, err := s.Store.ClientDietaryNeeds(r.Context(), c.ID); err == nil {
				page.Form.Values.Set("revision", strconv.Itoa(cur.Revision))
				now := "none"
				if labels := menu.NeedLabels(cur.Codes); len(labels) > 0 {
					now = strings.Join(labels, ", ")
				}
				page.Notice = "Someone else saved this client’s dietary needs after you opened the form (now: " + now +
					"). Your ticks are kept below: check them and save again."
			}
			s.Render(w, r, http.StatusConflict, "Dietary needs · "+c.Name, "clients", web.DietaryNeedsPage(page))
			return
		}
		s.StoreError(w, r, err)
		return
	}
	// Drafts take the new needs at once; published plans keep theirs.
	if err := s.resuggestDrafts(r, c); err != nil {
		s.ServerError(w, r, err)
		return
	}
	http.Redirect(w, r, web.Path("clients", c.ID)+"#dietary-needs", http.StatusSeeOther)
}

// resuggestDrafts makes the food suggestions of the client's drafts afresh.
func (s *Server) resuggestDrafts(r *http.Request, c store.Client) error {
	drafts, err := s.Store.ClientDrafts(r.Context(), c.ID)
	if err != nil {
		return err
	}
	for _, v := range drafts {
		sugg, err := s.planSuggestions(r.Context(), c, v.Result)
		if err != nil {
			return err
		}
		if err := s.Store.SetDraftSuggestions(r.Context(), v.ID, sugg); err != nil && !errors.Is(err, store.ErrNotDraft) {
			return err
		}
	}
	return nil
}
