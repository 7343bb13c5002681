package server

import (
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"strings"

	"github.com/go-chi/chi/v5"

	"larder/internal/sheet"
	"larder/internal/store"
	"larder/web"
)

// Plan sheet: the PDF a clinician hands over. The published version prints
// as it is; any version can be printed by number, a draft (or a superseded
// version) marked across every page.

func (s *Server) mountSheetRoutes(r chi.Router) {
	r.With(s.recordRead(store.ReadSheet)).Get("/clients/{clientID}/plans/{planID}/sheet.pdf", s.publishedSheet)
	r.With(s.recordRead(store.ReadSheet)).Get("/clients/{clientID}/plans/{planID}/versions/{version}/sheet.pdf", s.versionSheet)
}

func (s *Server) publishedSheet(w http.ResponseWriter, r *http.Request) {
	paper, form, ok := s.sheetPaper(w, r)
	if !ok {
		return
	}
	c, p, ok := s.planFromURL(w, r)
	if !ok {
		return
	}
	v, err := s.Store.PublishedPlanVersion(r.Context(), p.ID)
	if errors.Is(err, store.ErrNotFound) {
		s.Render(w, r, http.StatusNotFound, "No plan sheet yet", "clients",
			web.Message("No plan sheet yet", "Nothing of “"+p.Title+"” is published yet, so there is no sheet to hand over. "+
				"Publish the draft first, or print the draft itself from its version (marked as a draft, not for the client)."))
		return
	}
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.writeSheet(w, r, c, p, v, paper, form)
}

func (s *Server) versionSheet(w http.ResponseWriter, r *http.Request) {
	paper, form, ok := s.sheetPaper(w, r)
	if !ok {
		return
	}
	c, p, ok := s.planFromURL(w, r)
	if !ok {
		return
	}
	n, err := strconv.Atoi(chi.URLParam(r, "version"))
	if err != nil || n < 1 {
		s.NotFound(w, r)
		return
	}
	v, err := s.Store.PlanVersion(r.Context(), p.ID, n)
	if err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.writeSheet(w, r, c, p, v, paper, form)
}

// sheetPaper reads ?paper=a4|letter and ?form=staff|athlete; false means a
// 400 page was written.
func (s *Server) sheetPaper(w http.ResponseWriter, r *http.Request) (sheet.Paper, sheet.Form, bool) {
	paper, ok := sheet.ParsePaper(r.URL.Query().Get("paper"))
	if !ok {
		s.Render(w, r, http.StatusBadRequest, "Unknown paper size", "clients",
			web.Message("Unknown paper size", "The plan sheet prints on A4 or Letter paper: use ?paper=a4 or ?paper=letter (A4 when left out)."))
		return paper, "", false
	}
	form, ok := sheet.ParseForm(r.URL.Query().Get("form"))
	if !ok {
		s.Render(w, r, http.StatusBadRequest, "Unknown form of the sheet", "clients",
			web.Message("Unknown form of the sheet", "The plan sheet has two forms: the dietitian's (?form=staff, the default) and the athlete's (?form=athlete)."))
	}
	return paper, form, ok
}

func (s *Server) writeSheet(w http.ResponseWriter, r *http.Request, c store.Client, p store.Plan, v store.PlanVersion, paper sheet.Paper, form sheet.Form) {
	pdf, err := s.planSheetPDF(r, c, p, v, paper, form)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	name := fmt.Sprintf("plan-sheet-%s-v%d", fileWord(c.Name), v.Version)
	if form == sheet.FormAthlete {
		name = fmt.Sprintf("athlete-sheet-%s-v%d", fileWord(c.Name), v.Version)
	}
	if v.Status == store.PlanDraft {
		name += "-DRAFT"
	}
	w.Header().Set("Content-Type", "application/pdf")
	w.Header().Set("Content-Disposition", `inline; filename="`+name+`.pdf"`)
	w.Header().Set("Content-Length", strconv.Itoa(len(pdf)))
	w.Header().Set("Cache-Control", "no-store") // a client's health record
	_, _ = w.Write(pdf)
}

// planSheetPDF renders a plan version's sheet in either form (also used by
// the record export). The athlete's form gets the health note the
// dietitian shared, never the recorded cautions.
func (s *Server) planSheetPDF(r *http.Request, c store.Client, p store.Plan, v store.PlanVersion, paper sheet.Paper, form sheet.Form) ([]byte, error) {
	ctx := r.Context()
	sh := sheet.Sheet{
		PracticeName: s.PracticeName(r), ClientName: c.Name, Title: p.Title,
		KindLabel: kindLabel(p.Kind), Protocol: p.Protocol,
		Version: v.Version, Status: v.Status, PublishedAt: v.PublishedAt,
		BodyMassKg: v.BodyMassKg, BodyMassOn: v.BodyMassOn, MassUnit: c.Unit,
		Training: trainingByDate(v.Request.Training), Plan: v.Result, Printed: s.Now(),
		Form: form, PlanNote: v.Notes.Plan, DayNotes: v.Notes.Days,
		SharedNote: splitCautions(c.SharedNote), ShowFigures: c.AthleteSeesEnergyMass,
	}
	// The client's cautions as recorded now, and any the plan was computed
	// with that have since been taken off the record: on a sheet, a caution
	// too many is safer than one too few.
	seen := map[string]bool{}
	for _, x := range append(splitCautions(c.Cautions), v.Request.Cautions...) {
		if k := strings.ToLower(strings.TrimSpace(x)); k != "" && !seen[k] {
			seen[k] = true
			sh.ClientCautions = append(sh.ClientCautions, strings.TrimSpace(x))
		}
	}
	if form == sheet.FormAthlete {
		sh.ClientCautions = nil // the athlete's surfaces carry only the shared note
	}
	if p.EventID != nil {
		e, err := s.Store.EventByID(ctx, c.ID, *p.EventID)
		switch {
		case err == nil:
			sh.EventName, sh.EventZone = e.Name, e.TimeZone
			start := e.StartsAt
			sh.EventStart = &start
		case !errors.Is(err, store.ErrNotFound): // a deleted event leaves the plan as it was
			return nil, err
		}
	}
	if sh.EventStart == nil && v.Request.Event != nil {
		start := v.Request.Event.StartsAt
		sh.EventStart = &start
		sh.EventName = "event no longer on record"
	}
	sugg, err := s.Store.FeedSuggestions(ctx, v.ID)
	if err != nil {
		return nil, err
	}
	sh.Suggestions = sugg
	pdf, err := sheet.Render(sh, paper)
	if err != nil {
		return nil, fmt.Errorf("plan %d version %d sheet: %w", p.ID, v.Version, err)
	}
	return pdf, nil
}

// fileWord makes a name safe for a file name: ASCII letters and digits,
// the rest as single dashes.
func fileWord(name string) string {
	var b strings.Builder
	dash := false
	for _, r := range accents.Replace(strings.ToLower(name)) {
		switch {
		case r >= 'a' && r <= 'z' || r >= '0' && r <= '9':
			b.WriteRune(r)
			dash = false
		case !dash && b.Len() > 0:
			b.WriteByte('-')
			dash = true
		}
	}
	out := strings.TrimSuffix(b.String(), "-")
	if out == "" {
		return "client"
	}
	return out
}

var accents = strings.NewReplacer("á", "a", "à", "a", "â", "a", "ä", "a", "å", "a", "ã", "a", "æ", "ae",
	"ç", "c", "é", "e", "è", "e", "ê", "e", "ë", "e", "í", "i", "ì", "i", "î", "i", "ï", "i", "ñ", "n",
	"ó", "o", "ò", "o", "ô", "o", "ö", "o", "õ", "o", "ø", "o", "ß", "ss", "ú", "u", "ù", "u", "û", "u", "ü", "u", "ý", "y", "ÿ", "y")
