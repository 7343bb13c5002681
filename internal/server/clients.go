package server

import (
	"net/http"

	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

func (s *Server) clientList(w http.ResponseWriter, r *http.Request) {
	q := r.URL.Query()
	filter := store.ClientFilter{Query: q.Get("q"), Show: q.Get("show")}
	if filter.Show == "" {
		filter.Show = store.ShowActive
	}
	rows, err := s.Store.ListClients(r.Context(), filter)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, http.StatusOK, "Clients", "clients", web.ClientList(web.ClientListData{
		Query: filter.Query, Show: filter.Show, Rows: rows, Today: s.Today(),
	}))
}

func (s *Server) clientNewPage(w http.ResponseWriter, r *http.Request) {
	s.clientFormPage(w, r, http.StatusOK, "New client", web.ClientFormData{Form: forms.New()})
}

func (s *Server) clientFormPage(w http.ResponseWriter, r *http.Request, status int, title string, d web.ClientFormData) {
	d.PracticeUnit = s.PracticeMassUnit(r)
	s.Render(w, r, status, title, "clients", web.ClientForm(d))
}

func (s *Server) clientCreate(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	var in clientForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if f.Has() {
		s.clientFormPage(w, r, http.StatusUnprocessableEntity, "New client", web.ClientFormData{Form: f})
		return
	}
	var c store.Client
	in.apply(&c)
	if err := s.Store.CreateClient(r.Context(), Actor(r), &c); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Client "+c.Name+" added.")
	Redirect(w, r, web.Path("clients", c.ID))
}

func (s *Server) clientEditPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	s.clientFormPage(w, r, http.StatusOK, "Edit "+c.Name, web.ClientFormData{Client: &c, Form: forms.FromValues(clientValues(c))})
}

func (s *Server) clientUpdate(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in clientForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if loaded := r.PostForm.Get("loaded"); loaded != clientStamp(c) {
		// Saving would silently undo the other change; show it, and let a
		// second save (now on the fresh version) go through on purpose. A
		// form without its stamp (an old tab, a script) is refused alike:
		// nothing tells that it was made on the current details.
		f.Errors.Add("loaded", "Someone saved changes to this client at "+web.UTCStamp(c.UpdatedAt)+
			" UTC, after you opened this form. Nothing was saved. Check the client page for their change; saving this form again replaces it with what is below.")
		f.Values.Set("loaded", clientStamp(c))
		s.clientFormPage(w, r, http.StatusConflict, "Edit "+c.Name, web.ClientFormData{Client: &c, Form: f})
		return
	}
	if f.Has() {
		s.clientFormPage(w, r, http.StatusUnprocessableEntity, "Edit "+c.Name, web.ClientFormData{Client: &c, Form: f})
		return
	}
	in.apply(&c)
	if err := s.Store.UpdateClient(r.Context(), Actor(r), &c); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Client details saved.")
	Redirect(w, r, web.Path("clients", c.ID))
}

func (s *Server) clientArchive(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	if err := s.Store.ArchiveClient(r.Context(), Actor(r), c.ID); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, c.Name+" is archived. Their records are kept; find them under Archived on the Clients page.")
	Redirect(w, r, web.Path("clients", c.ID))
}

func (s *Server) clientUnarchive(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	if err := s.Store.UnarchiveClient(r.Context(), Actor(r), c.ID); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, c.Name+" is back among the active clients.")
	Redirect(w, r, web.Path("clients", c.ID))
}

// The client page lists training from three weeks back to two weeks ahead
// unless all of it is asked for: what a consultation is about.
const (
	trainingDaysBack  = 21
	trainingDaysAhead = 14
)

func (s *Server) clientPage(w http.ResponseWriter, r *http.Request) {
	id, ok := s.ParamID(w, r, "clientID")
	if !ok {
		return
	}
	// Everything the page shows, read in one round trip.
	today := s.Today()
	var (
		rd       store.Reads
		c        store.Client
		masses   []store.BodyMass
		training []store.TrainingSession
		events   []store.Event
		history  []store.AuditEntry
		needs    store.DietaryNeeds
		plans    []store.PlanRow
		links    []store.ClientLink
	)
	// The training log is read only for the window shown (with its count
	// for the "show all" link) unless all of it is asked for.
	allTraining := r.URL.Query().Get("training") == "all"
	var total int
	rd.Client(id, &c)
	rd.BodyMass(id, &masses)
	if allTraining {
		rd.Training(id, &training)
	} else {
		rd.RecentTraining(id, today.AddDate(0, 0, -trainingDaysBack), today.AddDate(0, 0, trainingDaysAhead), &training, &total)
	}
	rd.Events(id, &events)
	rd.AuditForClient(id, 12, &history)
	rd.DietaryNeeds(id, &needs)
	rd.Plans(id, &plans)
	rd.ClientLinks(id, &links)
	if err := s.Store.Read(r.Context(), &rd); err != nil {
		s.StoreError(w, r, err)
		return
	}
	if allTraining {
		total = len(training)
	}
	d := web.ClientPageData{
		Client: c, Today: today, BodyMass: masses, Training: training, TrainingTotal: total,
		AllTraining: allTraining, DaysBack: trainingDaysBack, DaysAhead: trainingDaysAhead, Events: events, History: history,
	}
	d.Needs = clientNeedsSection(c, needs)
	d.Plans = s.clientPlansSection(c, plans, events, training)
	d.Link = web.ClientLinkSection(s.linksViewOf(c, links, forms.New()))
	if len(masses) > 1 {
		var err error
		if d.BodyMassChart, err = s.clientBodyMassChart(r, c, masses); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	s.Render(w, r, http.StatusOK, c.Name, "clients", web.ClientPage(d))
}
