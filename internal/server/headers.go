package server

import (
	"io/fs"
	"net/http"
	"path"
	"strings"
)

// contentSecurityPolicy lets pages load scripts, styles, images and fonts
// from this site only: no inline script or style, no plugins, no framing,
// forms post only here. Charts carry their looks as SVG presentation
// attributes and page scripts and styles live under /static/ and /assets/.
const contentSecurityPolicy = "default-src 'self'; script-src 'self'; style-src 'self'; img-src 'self'; font-src 'self'; connect-src 'self'; object-src 'none'; frame-ancestors 'none'; base-uri 'self'; form-action 'self'"

// securityHeaders sets headers that keep pages out of other sites' frames,
// stop browsers guessing content types and running injected script, and,
// when the app is served over HTTPS (secure cookies on), tell browsers to
// use HTTPS only for a year.
func securityHeaders(https bool) func(http.Handler) http.Handler {
	return func(next http.Handler) http.Handler {
		return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			h := w.Header()
			h.Set("X-Content-Type-Options", "nosniff")
			h.Set("X-Frame-Options", "DENY")
			h.Set("Content-Security-Policy", contentSecurityPolicy)
			h.Set("Referrer-Policy", "same-origin")
			if https {
				h.Set("Strict-Transport-Security", "max-age=31536000")
			}
			next.ServeHTTP(w, r)
		})
	}
}

// noListing answers 404 for a folder of the static files instead of the
// file server's listing of its contents.
func noListing(files fs.FS, next http.Handler) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		name := strings.TrimPrefix(path.Clean("/"+r.URL.Path), "/")
		if name == "" {
			name = "."
		}
		if fi, err := fs.Stat(files, name); err != nil || fi.IsDir() {
			http.NotFound(w, r)
			return
		}
		next.ServeHTTP(w, r)
	})
}
