package auth

import (
	"crypto/rand"
	"crypto/sha256"
	"crypto/subtle"
	"encoding/base64"
)

// LinkTokenBytes is the size of a client-link token's randomness: 256 bits.
const LinkTokenBytes = 32

// linkTokenLen is the length of a token in unpadded base64url.
var linkTokenLen = base64.RawURLEncoding.EncodedLen(LinkTokenBytes)

// NewLinkToken makes a client-link token: 256 random bits as unpadded
// base64url (43 characters, safe in a URL path), and the SHA-256 hash under
// which it is stored. Only the hash may be kept; the token is shown once.
func NewLinkToken() (token string, hash []byte, err error) {
	b := make([]byte, LinkTokenBytes)
	if _, err := rand.Read(b); err != nil {
		return "", nil, err
	}
	token = base64.RawURLEncoding.EncodeToString(b)
	return token, HashLinkToken(token), nil
}

// HashLinkToken is the SHA-256 of a token's text: what the database holds
// and looks a token up by. A fast hash is enough because the token carries
// 256 bits of randomness, so no guessing or precomputation can reach it.
func HashLinkToken(token string) []byte {
	h := sha256.Sum256([]byte(token))
	return h[:]
}

// LinkTokenShape reports whether s looks like a token NewLinkToken made, so
// that junk in a URL is refused before any database lookup.
func LinkTokenShape(s string) bool {
	if len(s) != linkTokenLen {
		return false
	}
	b, err := base64.RawURLEncoding.Strict().DecodeString(s)
	return err == nil && len(b) == LinkTokenBytes
}

// LinkHashEqual compares two token hashes in constant time.
func LinkHashEqual(a, b []byte) bool {
	return len(a) == sha256.Size && subtle.ConstantTimeCompare(a, b) == 1
}
