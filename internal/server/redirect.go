package server

import (
	"net/url"
	"strings"
	"unicode/utf8"
)

// defaultNext is where sign-in leads when no safe target was given.
const defaultNext = "/"

// safeNext keeps a post-sign-in redirect on this site: only a path on this
// host, never something a browser could read as another host. Browsers
// drop tabs and newlines anywhere in a URL, strip leading control
// characters, treat a backslash like a slash and a leading "//" as a new
// host, so "/\t/evil.example" becomes "//evil.example". The target is
// therefore refused when it, or any percent-decoding of it, holds a control
// character or backslash, starts with "//", or parses with a scheme or host.
func safeNext(next string) string {
	if !isLocalPath(next) {
		return defaultNext
	}
	return next
}

func isLocalPath(next string) bool {
	if next == "" || len(next) > 2048 || next[0] != '/' {
		return false
	}
	s := next
	// Decode until nothing changes, so no layer of encoding can carry a
	// character a browser would act on; three layers is more than any
	// honest link needs. A stray "%" (a search for "100%") ends decoding:
	// browsers leave it as it is too.
	for i := 0; ; i++ {
		if !plainPath(s) || i == 4 {
			return false
		}
		d, err := url.PathUnescape(s)
		if err != nil || d == s {
			break
		}
		s = d
	}
	u, err := url.Parse(next)
	return err == nil && u.Scheme == "" && u.Host == "" && u.User == nil && u.Opaque == ""
}

// plainPath says s is valid UTF-8 starting with one slash and holds no
// control character or backslash.
func plainPath(s string) bool {
	if !utf8.ValidString(s) || !strings.HasPrefix(s, "/") || strings.HasPrefix(s, "//") {
		return false
	}
	for _, r := range s {
		if r < 0x20 || r == 0x7f || r == '\\' || (r >= 0x80 && r < 0xa0) {
			return false
		}
	}
	return true
}
