package server

import "github.com/go-chi/chi/v5"

// mountPlanRoutes adds the plan and food pages to the signed-in router.
// The plans engineer owns this file (issue 4).
func (s *Server) mountPlanRoutes(r chi.Router) {
	s.ClientPlansSection = s.clientPlansSection
	s.ClientBodyMassChart = s.clientBodyMassChart
	s.mountFoodRoutes(r)
	s.mountPlanPages(r)
	s.mountAPI(r)
}
