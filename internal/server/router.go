package server

import (
	"io/fs"
	"net/http"

	"github.com/go-chi/chi/v5"
	"github.com/go-chi/chi/v5/middleware"

	"larder/web"
)

func (s *Server) routes() http.Handler {
	r := chi.NewRouter()
	r.Use(middleware.RequestID, s.logRequests, s.recoverPanics, securityHeaders(s.secureCookies), s.timeLimit)
	// Cross-site POSTs are refused by the browser's own Sec-Fetch-Site and
	// Origin headers (net/http CrossOriginProtection), so forms need no token.
	r.Use(http.NewCrossOriginProtection().Handler)

	static, _ := fs.Sub(web.Static, "static")
	r.Handle("/static/*", http.StripPrefix("/static/", noListing(static, http.FileServerFS(static))))
	r.With(s.session).Get("/healthz", s.healthz)
	r.With(s.session).Head("/healthz", s.healthz)
	s.mountClientLinkRoutes(r) // public: the token in the URL is the only key
	r.NotFound(s.session(http.HandlerFunc(s.NotFound)).ServeHTTP)
	r.MethodNotAllowed(s.session(http.HandlerFunc(s.MethodNotAllowed)).ServeHTTP)

	r.Group(func(r chi.Router) {
		r.Use(s.session)

		r.Get("/signin", s.signInPage)
		r.Post("/signin", s.signIn)
		r.Get("/setup", s.setupPage)
		r.Post("/setup", s.setup)
		r.Post("/signout", s.signOut)
		// The guideline values and their sources hold no client data: open
		// to anyone, with the staff navigation for those signed in.
		r.Get("/sources", s.sourcesPage)

		r.Group(func(r chi.Router) {
			r.Use(s.requireUser)
			r.Get("/", s.overview)
			s.mountStaffRoutes(r)
			s.mountPlanRoutes(r)
			s.mountSheetRoutes(r)
			s.mountLinkRoutes(r)
			s.mountDataRoutes(r)
			s.mountExportRoutes(r)
			s.mountDietaryRoutes(r)

			r.Group(func(r chi.Router) {
				r.Use(s.requireAdmin)
				s.mountAdminRoutes(r)
			})
		})
	})
	return r
}
