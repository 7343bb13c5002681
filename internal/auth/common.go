package auth

import (
	_ "embed"
	"strings"
	"sync"
)

// commonList is a list of the most common long passwords (source and
// licence in commonpw/README.md), one a line.
//
//go:embed commonpw/passwords.txt
var commonList string

var (
	commonOnce sync.Once
	commonSet  map[string]struct{}
)

// IsCommonPassword reports whether password is one of the most common
// passwords that an attacker tries first, ignoring case and surrounding
// spaces (a capital first letter or a trailing space does not make
// "password123" harder to guess).
func IsCommonPassword(password string) bool {
	commonOnce.Do(func() {
		lines := strings.Split(commonList, "\n")
		commonSet = make(map[string]struct{}, len(lines))
		for _, l := range lines {
			if l = strings.TrimSpace(l); l != "" {
				commonSet[strings.ToLower(l)] = struct{}{}
			}
		}
	})
	_, ok := commonSet[strings.ToLower(strings.TrimSpace(password))]
	return ok
}

// CommonPasswordMessage is the message shown beside a refused password.
const CommonPasswordMessage = "This password is one of the most common ones, which attackers try first. Choose another: a few unrelated words together are easy to remember and hard to guess."
