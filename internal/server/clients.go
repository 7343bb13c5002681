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
	s.Render(w, r, http.StatusOK, "New client", "clients", web.ClientForm(web.ClientFormData{Form: forms.New()}))
}

func (s *Server) clientCreate(w http.ResponseWriter, r *http.Request) {
	if !s.ParseForm(w, r) {
		return
	}
	var in clientForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "New client", "clients", web.ClientForm(web.ClientFormData{Form: f}))
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
	s.Render(w, r, http.StatusOK, "Edit "+c.Name, "clients", web.ClientForm(web.ClientFormData{Client: &c, Form: forms.FromValues(clientValues(c))}))
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
		s.Render(w, r, http.StatusConflict, "Edit "+c.Name, "clients", web.ClientForm(web.ClientFormData{Client: &c, Form: f}))
		return
	}
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Edit "+c.Name, "clients", web.ClientForm(web.ClientFormData{Client: &c, Form: f}))
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
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	ctx := r.Context()
	masses, err := s.Store.ListBodyMass(ctx, c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	training, err := s.Store.ListTraining(ctx, c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	events, err := s.Store.ListEvents(ctx, c.ID)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	history, err := s.Store.AuditForClient(ctx, c.ID, 12)
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	today := s.Today()
	allTraining := r.URL.Query().Get("training") == "all"
	shown := training
	if !allTraining {
		from, to := today.AddDate(0, 0, -trainingDaysBack), today.AddDate(0, 0, trainingDaysAhead)
		shown = shown[:0:0]
		for _, t := range training {
			if !t.OnDate.Before(from) && !t.OnDate.After(to) {
				shown = append(shown, t)
			}
		}
	}
	d := web.ClientPageData{
		Client: c, Today: today, BodyMass: masses, Training: shown, TrainingTotal: len(training),
		AllTraining: allTraining, DaysBack: trainingDaysBack, DaysAhead: trainingDaysAhead, Events: events, History: history,
	}
	if d.Needs, err = s.clientNeedsSection(r, c); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if d.Plans, err = s.clientPlansSection(r, c); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if d.Link, err = s.clientLinkSection(r, c); err != nil {
		s.ServerError(w, r, err)
		return
	}
	if len(masses) > 1 {
		if d.BodyMassChart, err = s.clientBodyMassChart(r, c, masses); err != nil {
			s.ServerError(w, r, err)
			return
		}
	}
	s.Render(w, r, http.StatusOK, c.Name, "clients", web.ClientPage(d))
}
