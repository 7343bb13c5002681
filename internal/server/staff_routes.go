package server

import (
	"github.com/go-chi/chi/v5"

	"larder/internal/store"
)

// mountStaffRoutes adds the pages every signed-in staff member uses.
func (s *Server) mountStaffRoutes(r chi.Router) {
	r.Get("/account", s.accountPage)
	r.Post("/account/password", s.changePassword)
	r.Post("/account/sessions/{sessionID}/end", s.endSession)

	r.Get("/clients", s.clientList)
	r.Get("/clients/new", s.clientNewPage)
	r.Post("/clients", s.clientCreate)
	// Flat patterns (no sub-router), so plan routes under the same prefix can be added beside them.
	const c = "/clients/{clientID}"
	r.With(s.recordRead(store.ReadClient)).Get(c, s.clientPage)
	r.Post(c, s.clientUpdate)
	r.Get(c+"/edit", s.clientEditPage)
	r.Post(c+"/archive", s.clientArchive)
	r.Post(c+"/unarchive", s.clientUnarchive)

	r.Get(c+"/body-mass/new", s.bodyMassNewPage)
	r.Post(c+"/body-mass", s.bodyMassCreate)
	r.Get(c+"/body-mass/{id}/edit", s.bodyMassEditPage)
	r.Post(c+"/body-mass/{id}", s.bodyMassUpdate)
	r.Post(c+"/body-mass/{id}/delete", s.bodyMassDelete)

	r.Get(c+"/training/new", s.trainingNewPage)
	r.Post(c+"/training", s.trainingCreate)
	r.Get(c+"/training/{id}/edit", s.trainingEditPage)
	r.Post(c+"/training/{id}", s.trainingUpdate)
	r.Post(c+"/training/{id}/delete", s.trainingDelete)

	r.Get(c+"/events/new", s.eventNewPage)
	r.Post(c+"/events", s.eventCreate)
	r.Get(c+"/events/{id}/edit", s.eventEditPage)
	r.Post(c+"/events/{id}", s.eventUpdate)
	r.Post(c+"/events/{id}/delete", s.eventDelete)
}

// mountAdminRoutes adds the pages only admins may open.
func (s *Server) mountAdminRoutes(r chi.Router) {
	r.Get("/team", s.teamPage)
	r.Get("/team/reads", s.readsPage)
	r.Post("/team", s.teamAdd)
	r.Post("/team/practice", s.teamPractice)
	r.Post("/team/{userID}/role", s.teamRole)
	r.Post("/team/{userID}/disable", s.teamDisable)
	r.Post("/team/{userID}/enable", s.teamEnable)
	r.Post("/team/{userID}/password", s.teamResetPassword)
}
