package server

import (
	"context"
	"errors"
	"net/http"

	"larder/internal/forms"
	"larder/internal/store"
	"larder/web"
)

// Body mass, training and events are records of a client; each has a new
// page, an edit page (with delete), and the POSTs behind them. Every record
// is looked up together with its client id, so one client's URL cannot
// reach another client's rows.

func (s *Server) bodyMassNewPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	f := forms.New()
	f.Values.Set("measured_on", web.ISODate(s.Today()))
	f.Values.Set("unit", string(c.Unit))
	s.Render(w, r, http.StatusOK, "Add body mass", "clients", web.BodyMassForm(c, nil, f))
}

func (s *Server) bodyMassCreate(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in bodyMassForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today(), c.DateOfBirth)
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Add body mass", "clients", web.BodyMassForm(c, nil, f))
		return
	}
	m := store.BodyMass{ClientID: c.ID}
	in.apply(&m)
	if err := s.Store.AddBodyMass(r.Context(), Actor(r), &m); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Body mass "+web.MassText(m.MassKg, c.Unit)+" on "+web.Date(m.MeasuredOn)+" saved.")
	Redirect(w, r, web.Path("clients", c.ID)+"#body-mass")
}

// recordFromURL loads the client of the URL and one of their records by
// its {id}, answering the request itself (404, bad id) when it cannot.
func recordFromURL[T any](s *Server, w http.ResponseWriter, r *http.Request,
	load func(ctx context.Context, clientID, id int64) (T, error)) (store.Client, T, bool) {
	var none T
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return c, none, false
	}
	id, ok := s.ParamID(w, r, "id")
	if !ok {
		return c, none, false
	}
	rec, err := load(r.Context(), c.ID, id)
	if err != nil {
		s.StoreError(w, r, err)
		return c, none, false
	}
	return c, rec, true
}

func (s *Server) bodyMassFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.BodyMass, bool) {
	return recordFromURL(s, w, r, s.Store.BodyMassByID)
}

func (s *Server) bodyMassEditPage(w http.ResponseWriter, r *http.Request) {
	c, m, ok := s.bodyMassFromURL(w, r)
	if !ok {
		return
	}
	f := forms.FromValues(bodyMassValues(m, c.Unit))
	if err := s.setVersion(r, f, store.VersionBodyMass, m.ID); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, http.StatusOK, "Edit body mass", "clients", web.BodyMassForm(c, &m, f))
}

func (s *Server) bodyMassUpdate(w http.ResponseWriter, r *http.Request) {
	c, m, ok := s.bodyMassFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in bodyMassForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today(), c.DateOfBirth)
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Edit body mass", "clients", web.BodyMassForm(c, &m, f))
		return
	}
	in.apply(&m)
	if err := s.Store.UpdateBodyMass(guarded(r, store.VersionBodyMass, m.ID), Actor(r), &m); err != nil {
		if errors.Is(err, store.ErrStale) {
			if err := s.refuseStale(r, f, store.VersionBodyMass, m.ID); err != nil {
				s.ServerError(w, r, err)
				return
			}
			s.Render(w, r, http.StatusConflict, "Edit body mass", "clients", web.BodyMassForm(c, &m, f))
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Measurement of "+web.Date(m.MeasuredOn)+" saved.")
	Redirect(w, r, web.Path("clients", c.ID)+"#body-mass")
}

func (s *Server) bodyMassDelete(w http.ResponseWriter, r *http.Request) {
	c, m, ok := s.bodyMassFromURL(w, r)
	if !ok {
		return
	}
	if err := s.Store.DeleteBodyMass(r.Context(), Actor(r), c.ID, m.ID); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Measurement of "+web.Date(m.MeasuredOn)+" ("+web.MassText(m.MassKg, c.Unit)+") deleted.")
	Redirect(w, r, web.Path("clients", c.ID)+"#body-mass")
}

func (s *Server) trainingNewPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	f := forms.New()
	f.Values.Set("on_date", web.ISODate(s.Today()))
	f.Values.Set("intensity_kind", store.IntensityRPE)
	f.Values.Set("status", store.StatusDone)
	s.Render(w, r, http.StatusOK, "Add training", "clients", web.TrainingForm(c, nil, f))
}

func (s *Server) trainingCreate(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in trainingForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Add training", "clients", web.TrainingForm(c, nil, f))
		return
	}
	t := store.TrainingSession{ClientID: c.ID}
	in.apply(&t)
	if err := s.Store.AddTraining(r.Context(), Actor(r), &t); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Training on "+web.Date(t.OnDate)+" saved.")
	Redirect(w, r, web.Path("clients", c.ID)+"#training")
}

func (s *Server) trainingFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.TrainingSession, bool) {
	return recordFromURL(s, w, r, s.Store.TrainingByID)
}

func (s *Server) trainingEditPage(w http.ResponseWriter, r *http.Request) {
	c, t, ok := s.trainingFromURL(w, r)
	if !ok {
		return
	}
	f := forms.FromValues(trainingValues(t))
	if err := s.setVersion(r, f, store.VersionTraining, t.ID); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, http.StatusOK, "Edit training", "clients", web.TrainingForm(c, &t, f))
}

func (s *Server) trainingUpdate(w http.ResponseWriter, r *http.Request) {
	c, t, ok := s.trainingFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in trainingForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Edit training", "clients", web.TrainingForm(c, &t, f))
		return
	}
	in.apply(&t)
	if err := s.Store.UpdateTraining(guarded(r, store.VersionTraining, t.ID), Actor(r), &t); err != nil {
		if errors.Is(err, store.ErrStale) {
			if err := s.refuseStale(r, f, store.VersionTraining, t.ID); err != nil {
				s.ServerError(w, r, err)
				return
			}
			s.Render(w, r, http.StatusConflict, "Edit training", "clients", web.TrainingForm(c, &t, f))
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Training on "+web.Date(t.OnDate)+" saved.")
	Redirect(w, r, web.Path("clients", c.ID)+"#training")
}

func (s *Server) trainingDelete(w http.ResponseWriter, r *http.Request) {
	c, t, ok := s.trainingFromURL(w, r)
	if !ok {
		return
	}
	if err := s.Store.DeleteTraining(r.Context(), Actor(r), c.ID, t.ID); err != nil {
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Training on "+web.Date(t.OnDate)+" deleted.")
	Redirect(w, r, web.Path("clients", c.ID)+"#training")
}

func (s *Server) eventNewPage(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok {
		return
	}
	f := forms.New()
	f.Values.Set("priority", "A")
	f.Values.Set("days", "1")
	// Most clients race where they raced before: offer the zone of their latest event.
	f.Values.Set("time_zone", "UTC")
	if evs, err := s.Store.ListEvents(r.Context(), c.ID); err == nil && len(evs) > 0 {
		f.Values.Set("time_zone", evs[len(evs)-1].TimeZone)
	}
	s.Render(w, r, http.StatusOK, "Add event", "clients", web.EventForm(c, nil, f))
}

func (s *Server) eventCreate(w http.ResponseWriter, r *http.Request) {
	c, ok := s.ClientFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in eventForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Add event", "clients", web.EventForm(c, nil, f))
		return
	}
	e := store.Event{ClientID: c.ID}
	in.apply(&e)
	if err := s.Store.AddEvent(r.Context(), Actor(r), &e); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Flash(r, "Event "+e.Name+" saved.")
	Redirect(w, r, web.Path("clients", c.ID)+"#events")
}

func (s *Server) eventFromURL(w http.ResponseWriter, r *http.Request) (store.Client, store.Event, bool) {
	return recordFromURL(s, w, r, s.Store.EventByID)
}

func (s *Server) eventEditPage(w http.ResponseWriter, r *http.Request) {
	c, e, ok := s.eventFromURL(w, r)
	if !ok {
		return
	}
	f := forms.FromValues(eventValues(e))
	if err := s.setVersion(r, f, store.VersionEvent, e.ID); err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, http.StatusOK, "Edit event", "clients", web.EventForm(c, &e, f))
}

func (s *Server) eventUpdate(w http.ResponseWriter, r *http.Request) {
	c, e, ok := s.eventFromURL(w, r)
	if !ok || !s.ParseForm(w, r) {
		return
	}
	var in eventForm
	f := forms.Decode(r.PostForm, &in)
	in.check(f, s.Today())
	if f.Has() {
		s.Render(w, r, http.StatusUnprocessableEntity, "Edit event", "clients", web.EventForm(c, &e, f))
		return
	}
	in.apply(&e)
	if err := s.Store.UpdateEvent(guarded(r, store.VersionEvent, e.ID), Actor(r), &e); err != nil {
		if errors.Is(err, store.ErrStale) {
			if err := s.refuseStale(r, f, store.VersionEvent, e.ID); err != nil {
				s.ServerError(w, r, err)
				return
			}
			s.Render(w, r, http.StatusConflict, "Edit event", "clients", web.EventForm(c, &e, f))
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Event "+e.Name+" saved.")
	Redirect(w, r, web.Path("clients", c.ID)+"#events")
}

func (s *Server) eventDelete(w http.ResponseWriter, r *http.Request) {
	c, e, ok := s.eventFromURL(w, r)
	if !ok {
		return
	}
	if err := s.Store.DeleteEvent(r.Context(), Actor(r), c.ID, e.ID); err != nil {
		if isForeignKeyViolation(err) {
			s.Flash(r, "The event "+e.Name+" has plans made for it, so it cannot be deleted. Change it instead, or delete its plans first.")
			Redirect(w, r, web.Path("clients", c.ID, "events", e.ID, "edit"))
			return
		}
		s.StoreError(w, r, err)
		return
	}
	s.Flash(r, "Event "+e.Name+" deleted.")
	Redirect(w, r, web.Path("clients", c.ID)+"#events")
}
