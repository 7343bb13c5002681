package server

import (
	"fmt"
	"net/http"
	"strconv"
	"time"

	"larder/internal/fuel"
	"larder/internal/sheet"
	"larder/internal/store"
	"larder/web"
)

// The athlete's sheet from the client link: GET /c/{token}/sheet.pdf
// prints the athlete's form of the plan the phone page shows. Like the
// phone page it greets by first name and carries only the health note the
// dietitian shared, with energy and body-mass figures only when the
// dietitian chose to show them.

func (s *Server) clientSheet(w http.ResponseWriter, r *http.Request) {
	paper, ok := sheet.ParsePaper(r.URL.Query().Get("paper"))
	if !ok {
		http.Error(w, "The sheet prints on A4 or Letter paper: use ?paper=a4 or ?paper=letter.", http.StatusBadRequest)
		return
	}
	o, plans, ok := s.openLinkPlans(w, r)
	if !ok {
		return
	}
	now := s.Now()
	p, _, ok := currentPlan(plans, now)
	if !ok {
		w.Header().Set("Content-Type", "text/html; charset=utf-8")
		w.WriteHeader(http.StatusNotFound)
		v := web.ClientDayView{PracticeName: o.PracticeName, FirstName: firstName(o.ClientName), Caution: fuel.Caution,
			DateLabel: now.UTC().Format("Monday 2 January 2006")}
		if err := web.ClientDayPage(v).Render(r.Context(), w); err != nil {
			s.Log.Error("render", "path", "/c/…/sheet.pdf", "err", err)
		}
		return
	}
	pdf, err := sheet.Render(linkSheet(o, p, now), paper)
	if err != nil {
		s.linkError(w, r, fmt.Errorf("athlete's sheet of plan %d: %w", p.Plan.ID, err))
		return
	}
	w.Header().Set("Content-Type", "application/pdf")
	w.Header().Set("Content-Disposition", `inline; filename="fuelling-plan-v`+strconv.Itoa(p.Version.Version)+`.pdf"`)
	w.Header().Set("Content-Length", strconv.Itoa(len(pdf)))
	_, _ = w.Write(pdf)
}

// linkSheet is the athlete's form of a published plan seen from its link.
func linkSheet(o store.LinkOpen, p linkPlan, now time.Time) sheet.Sheet {
	v := p.Version
	sh := sheet.Sheet{
		Form: sheet.FormAthlete, PracticeName: o.PracticeName, ClientName: firstName(o.ClientName), Title: p.Plan.Title,
		KindLabel: kindLabel(p.Plan.Kind), Version: v.Version, Status: sheet.StatusPublished, PublishedAt: v.PublishedAt,
		BodyMassKg: v.BodyMassKg, Training: trainingByDate(v.Request.Training), Plan: v.Result,
		Suggestions: p.Suggestions, Printed: now, PlanNote: v.Notes.Plan, DayNotes: v.Notes.Days,
		SharedNote: splitCautions(o.SharedNote), ShowFigures: o.ShowFigures, MassUnit: o.MassUnit,
	}
	if ev := v.Request.Event; ev != nil {
		start := ev.StartsAt
		sh.EventStart = &start
		sh.EventName = "Your event"
		if p.eventName != "" {
			sh.EventName = p.eventName
		}
	}
	return sh
}
