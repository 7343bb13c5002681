package auth

import (
	"crypto/sha256"
	"encoding/base64"
	"encoding/hex"
	"strings"
	"testing"
)

func TestNewLinkToken(t *testing.T) {
	seen := map[string]bool{}
	for range 1000 {
		token, hash, err := NewLinkToken()
		if err != nil {
			t.Fatal(err)
		}
		if len(token) != 43 || strings.ContainsAny(token, "+/=") {
			t.Fatalf("token %q is not 43 characters of unpadded base64url", token)
		}
		raw, err := base64.RawURLEncoding.DecodeString(token)
		if err != nil || len(raw) != 32 {
			t.Fatalf("token %q does not carry 256 bits: %v", token, err)
		}
		if !LinkTokenShape(token) {
			t.Fatalf("own token %q refused", token)
		}
		want := sha256.Sum256([]byte(token))
		if !LinkHashEqual(hash, want[:]) {
			t.Fatal("hash is not the SHA-256 of the token")
		}
		if seen[token] {
			t.Fatal("token repeated")
		}
		seen[token] = true
	}
}

func TestHashLinkTokenIsSHA256(t *testing.T) {
	// FIPS 180-2, appendix B.1: SHA-256("abc").
	if got := hex.EncodeToString(HashLinkToken("abc")); got != "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" {
		t.Fatalf("SHA-256(abc) = %s", got)
	}
}

func TestLinkTokenShapeRefusesJunk(t *testing.T) {
	good, _, _ := NewLinkToken()
	for _, s := range []string{"", "abc", good + "A", good[:42], strings.Repeat("=", 43), good[:42] + "/", good[:42] + "+",
		"../../../../etc/passwd-xxxxxxxxxxxxxxxxxxxx", strings.Repeat("A", 42) + "B"} {
		if LinkTokenShape(s) {
			t.Errorf("accepted %q", s)
		}
	}
	if LinkHashEqual(HashLinkToken("a"), HashLinkToken("b")) || LinkHashEqual(nil, nil) {
		t.Error("different or empty hashes compared equal")
	}
}

// FuzzLinkTokenShape: whatever a URL holds, the check never panics and
// accepts only the canonical encoding of exactly 32 bytes.
func FuzzLinkTokenShape(f *testing.F) {
	good, _, _ := NewLinkToken()
	for _, s := range []string{"", good, good + "=", strings.Repeat("_", 43), "%00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		if !LinkTokenShape(s) {
			return
		}
		raw, err := base64.RawURLEncoding.DecodeString(s)
		if err != nil || len(raw) != 32 || base64.RawURLEncoding.EncodeToString(raw) != s {
			t.Fatalf("accepted non-canonical %q", s)
		}
	})
}
