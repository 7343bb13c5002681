package server

import (
	"net/http"

	"larder/internal/sources"
	"larder/web"
)

// sourcesPage lists every guideline value with its source and status.
func (s *Server) sourcesPage(w http.ResponseWriter, r *http.Request) {
	s.Render(w, r, http.StatusOK, "Sources", "sources", web.SourcesPage(web.SourcesView{Rows: sources.Rows()}))
}
