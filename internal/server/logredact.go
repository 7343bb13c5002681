package server

import (
	"net/http"
	"sort"
	"strings"

	"github.com/go-chi/chi/v5"
)

// redacted stands in for a secret in log lines.
const redacted = "REDACTED"

// secretNames are words that, in a URL parameter's name, mark its value as a
// key by itself (a client link's {token}; any later reset or API key).
var secretNames = []string{"token", "secret", "password", "passwd", "key", "sig", "code", "session"}

func isSecretName(name string) bool {
	n := strings.ToLower(name)
	for _, w := range secretNames {
		if strings.Contains(n, w) {
			return true
		}
	}
	return false
}

// logPath is the request's path as it may be written to a log: the value of
// every route parameter with a secret's name, and any path segment shaped
// like a random key (32 or more URL-safe characters, as link tokens are),
// is replaced. The second rule also covers addresses no route matched, so a
// mistyped link still leaves no key behind. Anyone who can read the logs
// must not be able to open a client's plan from them.
func logPath(r *http.Request) string {
	path := r.URL.EscapedPath()
	if rctx := chi.RouteContext(r.Context()); rctx != nil {
		for i, k := range rctx.URLParams.Keys {
			if v := rctx.URLParams.Values[i]; v != "" && isSecretName(k) {
				path = strings.ReplaceAll(path, v, redacted)
			}
		}
	}
	segs := strings.Split(path, "/")
	for i, s := range segs {
		if keyShaped(s) {
			segs[i] = redacted
		}
	}
	return strings.Join(segs, "/")
}

func keyShaped(s string) bool {
	if len(s) < 32 {
		return false
	}
	for _, c := range []byte(s) {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == '_' || c == '%' || c == '=' || c == '.' || c == '~') {
			return false
		}
	}
	return true
}

// logQuery names the query's keys only: values can hold secrets and, in a
// client search, people's names, which do not belong in a log either.
func logQuery(r *http.Request) string {
	q := r.URL.Query()
	if len(q) == 0 {
		return ""
	}
	keys := make([]string, 0, len(q))
	for k := range q {
		if len(k) > 40 || keyShaped(k) {
			k = redacted
		}
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return strings.Join(keys, ",")
}
