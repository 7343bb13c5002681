package server

import "github.com/go-chi/chi/v5"

// mountPlanRoutes adds the plan and food pages to the signed-in router.
func (s *Server) mountPlanRoutes(r chi.Router) {
	s.mountFoodRoutes(r)
	s.mountPlanPages(r)
	s.mountFeedFoodRoutes(r)
	s.mountSetAsideRoutes(r)
	s.mountAPI(r)
}
