package server

import (
	"errors"
	"net/http"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/go-chi/chi/v5"

	"larder/internal/auth"
	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

// Client links, staff side: the section on a client's page, creating a
// link (its token shown once) and revoking one. The client's own pages
// behind a link are in links_public.go.

// linkExpiries are the lifetimes a dietitian can choose, in days.
var linkExpiries = []int{30, 90, 180}

const defaultLinkExpiryDays = 90

// mountLinkRoutes adds the staff routes (inside the signed-in group; the
// cross-origin protection of the router covers the POSTs).
func (s *Server) mountLinkRoutes(r chi.Router) {
	r.Post("/clients/{clientID}/links", s.createClientLink)
	r.Post("/clients/{clientID}/links/{linkID}/revoke", s.revokeClientLink)
}

func linkExpiryOptions() []web.Option {
	out := make([]web.Option, len(linkExpiries))
	for i, d := range linkExpiries {
		out[i] = web.Option{Value: strconv.Itoa(d), Label: strconv.Itoa(d) + " days"}
	}
	return out
}

func (s *Server) linksView(r *http.Request, c store.Client, f forms.Form) (web.ClientLinksView, error) {
	links, err := s.Store.ClientLinks(r.Context(), c.ID)
	if err != nil {
		return web.ClientLinksView{}, err
	}
	return s.linksViewOf(c, links, f), nil
}

// linksViewOf is the links box of a client with these links, the form f
// beside them.
func (s *Server) linksViewOf(c store.Client, links []store.ClientLink, f forms.Form) web.ClientLinksView {
	if f.Get("expires_days") == "" {
		f.Values.Set("expires_days", strconv.Itoa(defaultLinkExpiryDays))
	}
	v := web.ClientLinksView{ClientID: c.ID, CreateURL: web.Path("clients", c.ID, "links"), Expiries: linkExpiryOptions(), Form: f}
	now := s.Now()
	for _, l := range links {
		line := web.ClientLinkLine{Label: l.Label, CreatedBy: l.CreatedByName, Created: linkWhen(l.CreatedAt),
			Expires: linkWhen(l.ExpiresAt), LastUsed: "never", Status: l.Status(now)}
		if line.CreatedBy == "" {
			line.CreatedBy = "Larder"
		}
		if l.LastUsedAt != nil {
			line.LastUsed = linkWhen(*l.LastUsedAt)
		}
		if line.Status == store.LinkRevoked {
			line.Status += " " + linkWhen(*l.RevokedAt)
		}
		if l.Status(now) == store.LinkActive {
			line.RevokeURL = web.Path("clients", c.ID, "links", l.ID, "revoke")
		}
		v.Links = append(v.Links, line)
	}
	return v
}

// linkWhen prints a moment for the staff table (UTC, like the audit table).
func linkWhen(t time.Time) string { return t.UTC().Format("2 Jan 2006 15:04") + " UTC" }

// linkInput is the create form.
type linkInput struct {
	Label string
	Days  int
}

// decodeLinkForm checks the create form; errors are keyed by field.
func decodeLinkForm(values map[string][]string) (linkInput, forms.Form) {
	f := forms.FromValues(values)
	var in linkInput
	in.Label = strings.TrimSpace(f.Get("label"))
	switch {
	case forms.BadText(in.Label):
		f.Errors.Add("label", "The label holds characters that are not text; please type it again.")
	case utf8.RuneCountInString(in.Label) > 100:
		f.Errors.Add("label", "Keep the label to 100 characters or fewer.")
	case strings.ContainsAny(in.Label, "\r\n\t"):
		f.Errors.Add("label", "The label must be on one line.")
	}
	days, err := strconv.Atoi(strings.TrimSpace(f.Get("expires_days")))
	ok := err == nil
	if ok {
		ok = false
		for _, d := range linkExpiries {
			ok = ok || d == days
		}
	}
	if !ok {
		f.Errors.Add("expires_days", "Choose how long the link works: 30, 90 or 180 days.")
	}
	in.Days = days
	return in, f
}

func (s *Server) createClientLink(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	in, f := decodeLinkForm(r.PostForm)
	if f.Has() {
		v, err := s.linksView(r, c, f)
		if err != nil {
			s.ServerError(w, r, err)
			return
		}
		s.Render(w, r, http.StatusUnprocessableEntity, "Client link", "clients", web.ClientLinkFormPage(c.Name, v))
		return
	}
	token, hash, err := auth.NewLinkToken()
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	now := s.Now()
	l := store.ClientLink{ClientID: c.ID, TokenHash: hash, Label: in.Label, CreatedAt: now, ExpiresAt: now.AddDate(0, 0, in.Days)}
	if err := s.Store.CreateClientLink(r.Context(), Actor(r), &l); err != nil {
		s.ServerError(w, r, err)
		return
	}
	// The token exists only in this response: it is rendered here, not
	// kept in the session for a redirect.
	base := externalBase(r) + "/c/" + token
	s.Render(w, r, http.StatusOK, "Client link", "clients", web.LinkCreated(web.LinkCreatedView{
		ClientID: c.ID, ClientName: c.Name, Label: l.Label, URL: base, CalendarURL: base + "/plan.ics",
		Expires: l.ExpiresAt.UTC().Format("Mon 2 Jan 2006 15:04") + " UTC",
	}))
}

func (s *Server) revokeClientLink(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	id, ok := s.ParamID(w, r, "linkID")
	if !ok {
		return
	}
	switch err := s.Store.RevokeClientLink(r.Context(), Actor(r), c.ID, id, s.Now()); {
	case errors.Is(err, store.ErrLinkRevoked):
		s.Flash(r, "That link was already revoked.")
	case err != nil:
		s.StoreError(w, r, err)
		return
	default:
		s.Flash(r, "Link revoked. It no longer opens anything.")
	}
	Redirect(w, r, web.Path("clients", c.ID)+"#client-link")
}

// externalBase is the scheme and host the staff member reached the app
// by, so the link works from the client's phone the same way.
func externalBase(r *http.Request) string {
	scheme := "http"
	if r.TLS != nil || strings.EqualFold(r.Header.Get("X-Forwarded-Proto"), "https") {
		scheme = "https"
	}
	return scheme + "://" + r.Host
}
