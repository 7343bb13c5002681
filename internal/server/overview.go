package server

import (
	"net/http"

	"larder/web"
)

// overview is the first page after sign-in: the practice's events soon and
// whether their plans are published, stale body masses before an event,
// published plans nobody opened, and forgotten drafts, each line linking
// to the page where the work is done.
func (s *Server) overview(w http.ResponseWriter, r *http.Request) {
	o, err := s.Store.PracticeOverview(r.Context(), s.Now())
	if err != nil {
		s.ServerError(w, r, err)
		return
	}
	s.Render(w, r, http.StatusOK, "Overview", "overview", web.Overview(web.OverviewData{O: o}))
}
