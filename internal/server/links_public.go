package server

import (
	"errors"
	"net/http"
	"sort"
	"strings"
	"time"

	"larder/internal/mass"

	"github.com/go-chi/chi/v5"

	"larder/internal/auth"
	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/store"
	"larder/web"
)

// The client's side of a client link: GET /c/{token} (phone page) and
// GET /c/{token}/plan.ics (calendar feed). No staff session is involved;
// the unguessable token is the only key, and it opens one client's
// published plans and nothing else.

// mountClientLinkRoutes adds the public routes (outside the sign-in group).
func (s *Server) mountClientLinkRoutes(r chi.Router) {
	r.Group(func(r chi.Router) {
		r.Use(clientLinkHeaders)
		r.Get("/c/{token}", s.clientDayPage)
		r.Get("/c/{token}/plan.ics", s.clientCalendar)
		r.Get("/c/{token}/sheet.pdf", s.clientSheet)
	})
}

// clientLinkHeaders keeps the link out of caches, referrers and search
// engines: the address itself is the secret.
func clientLinkHeaders(next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		h := w.Header()
		h.Set("Cache-Control", "no-store")
		h.Set("Referrer-Policy", "no-referrer")
		h.Set("X-Robots-Tag", "noindex, nofollow")
		next.ServeHTTP(w, r)
	})
}

// openLink resolves {token} to what its pages show, in one round trip
// (plus one write an hour to record the link's use); ok is false (and the
// plain "no longer valid" page written) for anything else.
func (s *Server) openLink(w http.ResponseWriter, r *http.Request) (store.LinkOpen, bool) {
	token := chi.URLParam(r, "token")
	if !auth.LinkTokenShape(token) {
		s.linkGone(w, r)
		return store.LinkOpen{}, false
	}
	hash := auth.HashLinkToken(token)
	o, err := s.Store.OpenClientLink(r.Context(), hash, s.Now())
	if errors.Is(err, store.ErrNotFound) || (err == nil && !auth.LinkHashEqual(o.Link.TokenHash, hash)) {
		s.linkGone(w, r)
		return store.LinkOpen{}, false
	}
	if err != nil {
		s.linkError(w, r, err)
		return store.LinkOpen{}, false
	}
	return o, true
}

func (s *Server) linkGone(w http.ResponseWriter, r *http.Request) {
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.WriteHeader(http.StatusNotFound)
	if err := web.ClientLinkGone().Render(renderCtx(r), w); err != nil {
		s.Log.Error("render", "path", "/c/…", "err", err)
	}
}

// linkError logs without the token (it is a secret) and answers plainly.
func (s *Server) linkError(w http.ResponseWriter, r *http.Request, err error) {
	if dbUnavailable(err) {
		s.Unavailable(w, r, err) // logs the path redacted
		return
	}
	s.Log.Error("client link", "err", err)
	http.Error(w, "Something went wrong on our side. Please try again later.", http.StatusInternalServerError)
}

// linkPlan is a published plan seen from the client's side.
type linkPlan struct {
	store.PublishedPlan
	eventName   string // "" when the plan has no event
	loc         *time.Location
	first, last string // plan day dates, YYYY-MM-DD
}

// linkPlans loads the link's published plans (decoded versions come from
// the store's cache of frozen versions) with their zones and spans.
// openLinkPlans opens the link of the request and loads its published plans;
// on failure it has answered and returns false.
func (s *Server) openLinkPlans(w http.ResponseWriter, r *http.Request) (store.LinkOpen, []linkPlan, bool) {
	o, ok := s.openLink(w, r)
	if !ok {
		return o, nil, false
	}
	plans, err := s.linkPlans(r, o)
	if err != nil {
		s.linkError(w, r, err)
		return o, nil, false
	}
	return o, plans, true
}

func (s *Server) linkPlans(r *http.Request, o store.LinkOpen) ([]linkPlan, error) {
	pubs, err := s.Store.LoadPublished(r.Context(), o.Plans)
	if err != nil {
		return nil, err
	}
	var out []linkPlan
	for i, p := range pubs {
		days := p.Version.Result.Days
		if len(days) == 0 {
			continue
		}
		lp := linkPlan{PublishedPlan: p, eventName: o.Plans[i].EventName, loc: planZone(p.Version.Result.TimeZone), first: days[0].Date, last: days[0].Date}
		for _, d := range days {
			lp.first, lp.last = min(lp.first, d.Date), max(lp.last, d.Date)
		}
		out = append(out, lp)
	}
	return out, nil
}

// planZone is the plan's time zone: an IANA name, or the "+01:00" offset
// form the engine writes when the request named none.
func planZone(name string) *time.Location {
	if name == "" {
		return time.UTC
	}
	if loc, err := zoneByName(name); err == nil {
		return loc
	}
	if t, err := time.Parse("-07:00", name); err == nil {
		_, off := t.Zone()
		return time.FixedZone(name, off)
	}
	return time.UTC
}

// currentPlan picks the plan the client sees: the published one whose days
// include today (in its own zone; the latest published when several do),
// else the next one to start. ok is false when neither exists.
func currentPlan(plans []linkPlan, now time.Time) (p linkPlan, today string, ok bool) {
	var covering, upcoming []linkPlan
	for _, lp := range plans {
		d := now.In(lp.loc).Format(time.DateOnly)
		switch {
		case lp.first <= d && d <= lp.last:
			covering = append(covering, lp)
		case lp.first > d:
			upcoming = append(upcoming, lp)
		}
	}
	if len(covering) > 0 {
		sort.SliceStable(covering, func(i, j int) bool { return publishedAt(covering[i]).After(publishedAt(covering[j])) })
		p = covering[0]
	} else if len(upcoming) > 0 {
		// The plan that starts first; of two from the same day (two plans
		// for one event), the one published last.
		sort.SliceStable(upcoming, func(i, j int) bool {
			if upcoming[i].first != upcoming[j].first {
				return upcoming[i].first < upcoming[j].first
			}
			return publishedAt(upcoming[i]).After(publishedAt(upcoming[j]))
		})
		p = upcoming[0]
	} else {
		return linkPlan{}, "", false
	}
	return p, now.In(p.loc).Format(time.DateOnly), true
}

func publishedAt(p linkPlan) time.Time {
	if t := p.Version.PublishedAt; t != nil {
		return *t
	}
	return p.Version.CreatedAt
}

// nextDaysShown is how many coming plan days the phone page lists.
const nextDaysShown = 4

func (s *Server) clientDayPage(w http.ResponseWriter, r *http.Request) {
	o, plans, ok := s.openLinkPlans(w, r)
	if !ok {
		return
	}
	now := s.Now()
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	key := phonePageKey(r.URL.Path, o, plans, now)
	if body, ok := s.phonePages.Get(key); ok {
		writeBody(w, body)
		return
	}
	body, err := renderPage(renderCtx(r), web.ClientDayPage(clientDayView(r.URL.Path, o, plans, now)))
	if err != nil {
		s.Log.Error("render", "path", "/c/…", "err", err)
		http.Error(w, "Something went wrong on our side. Please try again.", http.StatusInternalServerError)
		return
	}
	s.phonePages.Add(key, body)
	writeBody(w, body)
}

// clientDayView builds the phone page of the link at path on the day of
// now. What it reads is exactly what phonePageKey names: keep them alike.
func clientDayView(path string, o store.LinkOpen, plans []linkPlan, now time.Time) web.ClientDayView {
	v := web.ClientDayView{
		PracticeName: o.PracticeName, FirstName: firstName(o.ClientName), Caution: fuel.Caution,
		Notes: splitCautions(o.SharedNote), ShowFigures: o.ShowFigures, MassUnit: o.MassUnit, CalendarURL: path + "/plan.ics",
		SheetURL:  path + "/sheet.pdf",
		DateLabel: now.UTC().Format("Monday 2 January 2006"),
	}
	if p, today, ok := currentPlan(plans, now); ok {
		fillDay(&v, p, today, now)
		v.Next = daysAhead(plans, today)
	}
	return v
}

// fillDay puts today's part of plan p into v (its coming days come from
// daysAhead). Every figure is the stored plan's, only formatted.
func fillDay(v *web.ClientDayView, p linkPlan, today string, now time.Time) {
	plan := p.Version.Result
	if plan.Caution != "" {
		v.Caution = plan.Caution
	}
	v.DateLabel = now.In(p.loc).Format("Monday 2 January 2006")
	v.ZoneLabel = p.loc.String()
	v.PlanTitle = p.Plan.Title
	v.PlanNote = noteLines(p.Version.Notes.Plan)
	v.BodyMass = mass.Text(p.Version.BodyMassKg, v.MassUnit)
	if g := plan.ExpectedMassGainKg; g != nil {
		hi := *g
		if plan.ExpectedMassGainKgMax != nil {
			hi = *plan.ExpectedMassGainKgMax
		}
		v.MassGain = mass.Difference(*g, hi, v.MassUnit)
	}
	for _, d := range plan.Days {
		if d.Date == today {
			v.Today = todayView(p, d)
			v.Today.Note = noteLines(p.Version.Notes.Day(d.Date))
		}
	}
	if v.Today == nil && p.first > today {
		v.Upcoming = "Your plan starts on " + longDay(p.first) + "."
	}
}

// daysAhead lists the coming days after today, each from the plan that
// owns it (dayOwners: the one published last of those covering it), so
// that a race-day plan made after a loading plan gives its own figures and
// notes for race day here as in the calendar, before race day comes.
func daysAhead(plans []linkPlan, today string) []web.ClientDayBrief {
	owners := dayOwners(plans)
	type day struct {
		date  string
		brief web.ClientDayBrief
	}
	var ahead []day
	for _, p := range plans {
		for _, d := range p.Version.Result.Days {
			if d.Date <= today || owners[d.Date] != p.Plan.ID {
				continue
			}
			ahead = append(ahead, day{d.Date, web.ClientDayBrief{DateLabel: dayWords(d.Date), Role: clientRoleWords(d),
				ChoG: web.Num(d.ChoG, 0), ChoGPerKg: web.Num(d.ChoGPerKg, 1), Event: d.Role == "event",
				Note: strings.TrimSpace(p.Version.Notes.Day(d.Date))}})
		}
	}
	sort.SliceStable(ahead, func(i, j int) bool { return ahead[i].date < ahead[j].date })
	var out []web.ClientDayBrief
	for _, d := range ahead[:min(len(ahead), nextDaysShown)] {
		out = append(out, d.brief)
	}
	return out
}

// noteLines splits a note to the athlete into its paragraphs.
func noteLines(note string) []string {
	var out []string
	for _, l := range strings.Split(note, "\n") {
		if l = strings.TrimSpace(l); l != "" {
			out = append(out, l)
		}
	}
	return out
}

func todayView(p linkPlan, d fuel.Day) *web.ClientToday {
	t := &web.ClientToday{Role: clientRoleWords(d), ChoG: web.Num(d.ChoG, 0), ChoGPerKg: web.Num(d.ChoGPerKg, 1),
		ProteinG: web.Num(d.ProteinG, 0), FatG: web.Num(d.FatG, 0), EnergyKcal: web.Num(d.EnergyKcal, 0),
		LowFibre: d.LowFibre, Advice: d.Advice}
	// The engine's advice usually says it already; say it once.
	for _, a := range d.Advice {
		if strings.Contains(strings.ToLower(a), "fibre") {
			t.LowFibre = false
		}
	}
	// The in-event feed of a block of hours, a stage or the event is shown
	// once, in the box or line that gives its rate, with its food idea;
	// listing it again among the feeds would give the athlete the same
	// total twice.
	inEvent := map[int64]web.ClientFeed{}
	for i, f := range d.Feeds {
		fv := web.ClientFeed{Time: f.At.In(p.loc).Format("15:04"), Label: clientFeedLabel(f.Label), ChoG: web.Num(f.ChoG, 0),
			Suggestion: p.Suggestions[menu.FeedKey("day", d.Date, i)], Key: menu.FeedKey("day", d.Date, i),
			Event: f.Label == "pre-event meal" || f.Label == "during event"}
		if fv.Suggestion == menu.NoFit {
			fv.Suggestion = ""
		}
		if f.ProteinG > 0 {
			fv.ProteinG = web.Num(f.ProteinG, 0)
		}
		if f.Label == "during event" {
			inEvent[f.At.Unix()] = fv
		}
		t.Feeds = append(t.Feeds, fv)
	}
	shown := map[string]bool{} // keys of in-event feeds a box or line carries
	t.Race = raceToday(p, d, inEvent, shown)
	t.Event = eventToday(p, d, inEvent, shown)
	feeds := t.Feeds[:0]
	for _, f := range t.Feeds {
		if !shown[f.Key] {
			feeds = append(feeds, f)
		}
	}
	t.Feeds = feeds
	return t
}

// eventToday is the event box of a single event's day (a stage race's
// days show their stages instead, raceToday), or nil; the in-event feed it
// shows is marked in shown.
func eventToday(p linkPlan, d fuel.Day, inEvent map[int64]web.ClientFeed, shown map[string]bool) *web.ClientEventDay {
	plan := p.Version.Result
	ev := p.Version.Request.Event
	if ev == nil || ev.StartsAt.In(p.loc).Format(time.DateOnly) != d.Date || len(plan.Stages) > 0 {
		return nil
	}
	e := &web.ClientEventDay{Name: "Your event", Start: ev.StartsAt.In(p.loc).Format("15:04")}
	if p.eventName != "" {
		e.Name = p.eventName
	}
	if m := plan.PreEventMeal; m != nil {
		e.PreMealTime = m.At.In(p.loc).Format("15:04")
	}
	if de := plan.DuringEvent; de != nil && de.ChoGPerH > 0 {
		e.DuringGPerH, e.DuringTotalG, e.DuringHours = web.Num(de.ChoGPerH, 0), web.Num(de.TotalChoG, 0), hoursWords(de.DurationMin)
		// With legs nothing is eaten in the swim: a rate over the whole race
		// would not add up to the total, so the box gives the total and the
		// legs below give each rate.
		e.DuringLegs = len(de.Segments) > 0
		// The event's one in-event feed (at the start, or after the swim
		// of a multi-sport race); an event over blocks of hours has one a
		// block, shown on the block's line.
		if len(de.Blocks) == 0 && len(inEvent) == 1 {
			for _, f := range inEvent {
				e.Suggestion, e.Key = f.Suggestion, f.Key
				shown[f.Key] = true
			}
		}
	}
	return e
}

// dayOwners gives, for each plan date, the plan whose figures the client
// follows that day: of the published plans covering it, the one published
// last — the same rule as the phone page's — so two plans for one event do
// not put two sets of feeding times in the client's calendar.
func dayOwners(plans []linkPlan) map[string]int64 {
	owner := map[string]linkPlan{}
	for _, p := range plans {
		for _, d := range p.Version.Result.Days {
			if cur, ok := owner[d.Date]; !ok || publishedAt(p).After(publishedAt(cur)) {
				owner[d.Date] = p
			}
		}
	}
	out := make(map[string]int64, len(owner))
	for date, p := range owner {
		out[date] = p.Plan.ID
	}
	return out
}

func withoutNoFit(m map[string]string) map[string]string {
	out := make(map[string]string, len(m))
	for k, v := range m {
		if v != menu.NoFit {
			out[k] = v
		}
	}
	return out
}

// firstName is the first word of the client's name: the page greets the
// client and shows no more of the record than that.
func firstName(name string) string {
	if f := strings.Fields(name); len(f) > 0 {
		return f[0]
	}
	return "there"
}

func clientRoleWords(d fuel.Day) string {
	role := d.Role
	if role == "training" && d.LoadBand == "rest" {
		return "Rest day"
	}
	switch role {
	case "load":
		return "Carbohydrate loading day"
	case "taper":
		return "Taper day"
	case "event":
		return "Event day"
	case "recovery":
		return "Recovery day"
	case "repletion":
		return "Refuelling day"
	case "training":
		return "Training day"
	}
	if role == "" {
		return "Plan day"
	}
	return strings.ToUpper(role[:1]) + role[1:] + " day"
}

func clientFeedLabel(label string) string {
	switch label {
	case "during event":
		return "During the event (in all)"
	case "refuel":
		return "Refuel"
	case "":
		return "Snack"
	}
	return strings.ToUpper(label[:1]) + label[1:]
}

func longDay(date string) string {
	t, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return date
	}
	return t.Format("Monday 2 January")
}
