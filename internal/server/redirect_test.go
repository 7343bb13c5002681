package server

import (
	"net/http"
	"net/url"
	"strings"
	"testing"

	"larder/internal/store"
)

func TestSafeNext(t *testing.T) {
	keep := []string{
		"/clients",
		"/clients?q=x",
		"/clients/12/plans/3",
		"/clients?q=100%",
		"/clients?q=caf%C3%A9",
		"/foods#top",
		"/a/b/../c",
	}
	for _, next := range keep {
		if got := safeNext(next); got != next {
			t.Errorf("safeNext(%q) = %q, want it kept", next, got)
		}
	}
	refuse := []string{
		"",
		"clients",
		"//evil.example",
		"//evil.example/x",
		"/\\evil.example",
		"\\\\evil.example",
		"/\t/evil.example", // browsers drop the tab: //evil.example
		"/\n/evil.example", // and newlines
		"/\r/evil.example",
		"/%09/evil.example", // the same, one layer of encoding deeper
		"/%0a/evil.example",
		"/%0D/evil.example",
		"/%2509/evil.example", // and two
		"/%5Cevil.example",    // encoded backslash
		"/%2F/evil.example",   // encoded slash making //
		"/%252F%252Fevil.example",
		"https://evil.example",
		"http:evil.example",
		"javascript:alert(1)",
		" /clients",
		"\x00/clients",
		"/clients\x00",
		"/clients\x7f",
		"/clients\u0085",
		"/\xff",
		"/" + strings.Repeat("a", 3000),
	}
	for _, next := range refuse {
		if got := safeNext(next); got != defaultNext {
			t.Errorf("safeNext(%q) = %q, want it refused (%q)", next, got, defaultNext)
		}
	}
}

// Signing in with a crafted next lands on the overview, both from the
// form and when already signed in.
func TestSignInNextStaysOnSite(t *testing.T) {
	a := newApp(t)
	u := a.user(store.RoleDietitian, false)
	for _, next := range []string{"/\t/evil.example", "/%09/evil.example", "/\\evil.example", "https://evil.example/"} {
		b := a.browser()
		res := b.post("/signin", url.Values{"email": {u.Email}, "password": {testPassword}, "next": {next}})
		if res.status != http.StatusSeeOther || res.location != defaultNext {
			t.Errorf("sign-in with next=%q: %d to %q, want 303 to %s", next, res.status, res.location, defaultNext)
		}
		res = b.get("/signin?next=" + url.QueryEscape(next))
		if res.status != http.StatusSeeOther || res.location != defaultNext {
			t.Errorf("signed-in GET /signin?next=%q: %d to %q, want 303 to %s", next, res.status, res.location, defaultNext)
		}
	}
}

// browserView is what a browser makes of a Location value: it drops tabs
// and newlines anywhere, strips leading C0 controls and spaces, and reads
// backslashes as slashes.
func browserView(s string) string {
	s = strings.Map(func(r rune) rune {
		switch r {
		case '\t', '\n', '\r':
			return -1
		case '\\':
			return '/'
		}
		return r
	}, s)
	return strings.TrimLeft(s, "\x00\x01\x02\x03\x04\x05\x06\x07\x08\x0b\x0c\x0e\x0f\x10\x11\x12\x13\x14\x15\x16\x17\x18\x19\x1a\x1b\x1c\x1d\x1e\x1f ")
}

// Whatever the target, the result stays on this site for a browser, after
// any number of percent-decodings.
func FuzzSafeNext(f *testing.F) {
	for _, s := range []string{"/clients", "/%09/evil.example", "//x", "/\\x", "/%2509/x", "https://x", "/a?b=c#d", "/\t/x"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, next string) {
		got := safeNext(next)
		if got != next && got != defaultNext {
			t.Fatalf("safeNext(%q) = %q: neither the input nor the default", next, got)
		}
		s := got
		for range 5 {
			v := browserView(s)
			if !strings.HasPrefix(v, "/") || strings.HasPrefix(v, "//") {
				t.Fatalf("safeNext(%q) = %q, which a browser reads as %q", next, got, v)
			}
			u, err := url.Parse(v)
			if err == nil && (u.Scheme != "" || u.Host != "") {
				t.Fatalf("safeNext(%q) = %q parses with scheme %q host %q", next, got, u.Scheme, u.Host)
			}
			d, err := url.PathUnescape(s)
			if err != nil {
				break
			}
			s = d
		}
	})
}
