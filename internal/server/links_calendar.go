package server

// The calendar feed of a client link (GET /c/{token}/plan.ics): built from
// the published plans and kept, bounded, under a key of what it is made of.

import (
	"bytes"
	"fmt"
	"net/http"
	"strings"
	"time"

	lru "github.com/hashicorp/golang-lru/v2"

	"larder/internal/sheet"
	"larder/internal/store"
)

// feedLinkWindow keeps recently ended plans in the calendar feed for a
// week, so today's entries do not vanish from a phone at midnight.
const feedLinkWindow = 7 * 24 * time.Hour

func (s *Server) clientCalendar(w http.ResponseWriter, r *http.Request) {
	o, plans, ok := s.openLinkPlans(w, r)
	if !ok {
		return
	}
	now := s.Now()
	key := calendarKey(o, plans, now)
	if body, ok := s.calendars.Get(key); ok {
		writeCalendar(w, body)
		return
	}
	cal := sheet.ICSCalendar{ProdID: "-//Larder//Client link//EN", Name: "Fuelling plan · " + firstName(o.ClientName)}
	owners := dayOwners(plans)
	for _, p := range plans {
		if p.last < now.Add(-feedLinkWindow).In(p.loc).Format(time.DateOnly) {
			continue
		}
		result := p.Version.Result
		result.Days = nil
		for _, d := range p.Version.Result.Days {
			if owners[d.Date] == p.Plan.ID {
				result.Days = append(result.Days, d)
			}
		}
		if len(result.Days) == 0 {
			continue // every day of it is covered by a plan published later
		}
		ip := sheet.ICSPlan{PlanID: p.Plan.ID, Version: p.Version.Version, Published: publishedAt(p),
			Plan: result, Suggestions: withoutNoFit(p.Suggestions)}
		if strings.TrimSpace(o.SharedNote) != "" {
			ip.FoodNote = "The food ideas are examples only. Swap them for foods that suit your health note and that you know you tolerate."
		}
		if ev := p.Version.Request.Event; ev != nil && owners[ev.StartsAt.In(p.loc).Format(time.DateOnly)] == p.Plan.ID {
			start := ev.StartsAt
			ip.EventStart, ip.EventDurationMin, ip.EventName = &start, ev.ExpectedDurationMin, "Event start"
			if p.eventName != "" {
				ip.EventName = p.eventName
			}
		}
		cal.Events = append(cal.Events, sheet.ICSPlanEvents(ip)...)
	}
	var buf bytes.Buffer
	if err := sheet.ICSWrite(&buf, cal); err != nil {
		s.linkError(w, r, err)
		return
	}
	s.calendars.Add(key, buf.Bytes())
	writeCalendar(w, buf.Bytes())
}

func writeCalendar(w http.ResponseWriter, body []byte) {
	w.Header().Set("Content-Type", "text/calendar; charset=utf-8")
	w.Header().Set("Content-Disposition", `inline; filename="plan.ics"`)
	_, _ = w.Write(body)
}

// calendarCacheSize bounds the calendar feeds kept in memory (a feed is a
// few tens of KB).
const calendarCacheSize = 128

// calendarKey names everything a client's calendar feed is made of: the
// first name, whether a health note is shared, and each published
// plan's frozen version, event name and whether it is still in the feed's
// window. Equal keys give byte-equal feeds, so a phone polling its
// calendar is answered without building it again; publishing a new
// version, renaming the event or the client changes the key.
func calendarKey(o store.LinkOpen, plans []linkPlan, now time.Time) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%q|%t", firstName(o.ClientName), strings.TrimSpace(o.SharedNote) != "")
	for _, p := range plans {
		inWindow := p.last >= now.Add(-feedLinkWindow).In(p.loc).Format(time.DateOnly)
		fmt.Fprintf(&b, "|%d:%d:%q:%t", p.Plan.ID, p.Version.ID, p.eventName, inWindow)
	}
	return b.String()
}

func newCalendarCache() *lru.Cache[string, []byte] {
	c, err := lru.New[string, []byte](calendarCacheSize)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return c
}
