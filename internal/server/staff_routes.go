package server

import "github.com/go-chi/chi/v5"

// mountStaffRoutes adds the pages every signed-in staff member uses.
func (s *Server) mountStaffRoutes(r chi.Router) {
	r.Get("/account", s.accountPage)
	r.Post("/account/password", s.changePassword)
}

// mountAdminRoutes adds the pages only admins may open.
func (s *Server) mountAdminRoutes(r chi.Router) {
}
