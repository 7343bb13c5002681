package server

import (
	"errors"
	"net/http"
	"slices"
	"strconv"
	"strings"

	"github.com/go-chi/chi/v5"

	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// A dietitian's food choice names its feed by kind, date and place in the
// day, and a new version copies the choices of the one it came from. When a
// change of the plan takes a feed away (fewer eating occasions, other days),
// its choice is set aside: no view of the plan shows it, since they all read
// a feed's food by the feeds the version has, and the plan page lists it
// for the dietitian, who removes it from a draft.

func (s *Server) mountSetAsideRoutes(r chi.Router) {
	r.Post("/clients/{clientID}/plans/{planID}/versions/{version}/set-aside-choices", s.removeSetAsideChoices)
}

// setAsideChoices are the choices of a version whose feed it no longer has,
// in feed order.
func setAsideChoices(v store.PlanVersion, choices map[string][]menu.ChoiceLine) []web.SetAsideChoice {
	var out []web.SetAsideChoice
	for key, lines := range choices {
		kind, date, index, ok := splitFeedKey(key)
		if !ok || len(lines) == 0 {
			continue
		}
		if _, found := findFeed(v.Result, kind, date, index); found {
			continue
		}
		out = append(out, web.SetAsideChoice{Key: key, Feed: setAsideFeedWords(kind, date, index),
			Text: strings.TrimPrefix(menu.ChoiceText(lines), menu.ChoicePrefix)})
	}
	slices.SortFunc(out, func(a, b web.SetAsideChoice) int { return strings.Compare(a.Key, b.Key) })
	return out
}

// splitFeedKey reads a key of menu.FeedKey ("day:2027-04-16:2").
func splitFeedKey(key string) (kind, date string, index int, ok bool) {
	parts := strings.Split(key, ":")
	if len(parts) != 3 {
		return "", "", 0, false
	}
	i, err := strconv.Atoi(parts[2])
	if err != nil || i < 0 {
		return "", "", 0, false
	}
	return parts[0], parts[1], i, true
}

// setAsideFeedWords names a feed that is gone: its place is all that is known.
func setAsideFeedWords(kind, date string, index int) string {
	switch kind {
	case "pre_event":
		return "the pre-event meal of " + dayWords(date)
	case "repletion":
		return "repletion feed " + strconv.Itoa(index+1) + " of " + dayWords(date)
	}
	return "feed " + strconv.Itoa(index+1) + " of " + dayWords(date)
}

func (s *Server) removeSetAsideChoices(w http.ResponseWriter, r *http.Request) {
	c, p, v, _, ok := s.versionFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	revision, ok := formRevision(w, r)
	if !ok {
		return
	}
	back := web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version)
	n, err := s.Store.RemoveSetAsideChoices(r.Context(), Actor(r), v.ID, revision, r.PostForm["feed"])
	switch {
	case errors.Is(err, store.ErrStaleRevision):
		s.Flash(r, "Nothing removed: someone saved this draft after you opened it. Look at the set-aside choices again and remove them from here.")
	case errors.Is(err, store.ErrNotDraft):
		s.Flash(r, "Nothing removed: this version is no longer a draft. Start a new version to remove set-aside food choices.")
	case err != nil:
		s.StoreError(w, r, err)
		return
	case n == 0:
		s.Flash(r, "Nothing removed: that feed is in the plan again, so its food choice is in use.")
	default:
		s.Flash(r, "The set-aside food choice is removed.")
	}
	Redirect(w, r, back+"#set-aside-choices")
}
