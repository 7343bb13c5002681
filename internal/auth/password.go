// Package auth owns staff authentication: password hashing (Argon2id in a
// PHC-style string) and the session manager whose sessions live in
// PostgreSQL, and the tokens of client links (only their SHA-256 is stored).
package auth

import (
	"crypto/rand"
	"crypto/subtle"
	"encoding/base64"
	"errors"
	"fmt"
	"strings"

	"golang.org/x/crypto/argon2"
)

// Argon2id parameters: 19 MiB, 2 passes, 1 lane — the smallest setting the
// OWASP password-storage guidance lists, chosen so a 2-core server signs
// people in quickly while each guess still costs memory.
const (
	argonTime    = 2
	argonMemory  = 19 * 1024
	argonThreads = 1
	argonKeyLen  = 32
	saltLen      = 16
)

// Password length limits, checked by forms before hashing.
const (
	MinPasswordLen = 10
	MaxPasswordLen = 200
)

var b64 = base64.RawStdEncoding

// HashPassword returns "$argon2id$v=19$m=...,t=...,p=...$salt$hash".
func HashPassword(password string) (string, error) {
	salt := make([]byte, saltLen)
	if _, err := rand.Read(salt); err != nil {
		return "", err
	}
	key := argon2.IDKey([]byte(password), salt, argonTime, argonMemory, argonThreads, argonKeyLen)
	return fmt.Sprintf("$argon2id$v=%d$m=%d,t=%d,p=%d$%s$%s",
		argon2.Version, argonMemory, argonTime, argonThreads, b64.EncodeToString(salt), b64.EncodeToString(key)), nil
}

// ErrBadHash is returned for a stored hash this package cannot read.
var ErrBadHash = errors.New("auth: unreadable password hash")

// CheckPassword reports whether password matches the encoded hash, using the
// parameters stored in the hash so older hashes keep working after a change.
func CheckPassword(encoded, password string) (bool, error) {
	parts := strings.Split(encoded, "$")
	if len(parts) != 6 || parts[1] != "argon2id" {
		return false, ErrBadHash
	}
	var version int
	if _, err := fmt.Sscanf(parts[2], "v=%d", &version); err != nil || version != argon2.Version {
		return false, ErrBadHash
	}
	var mem, t uint32
	var p uint8
	// Limits guard against a crafted hash asking for huge memory or time.
	if _, err := fmt.Sscanf(parts[3], "m=%d,t=%d,p=%d", &mem, &t, &p); err != nil || t == 0 || t > 10 || p == 0 || p > 16 || mem < 8 || mem > 1<<17 {
		return false, ErrBadHash
	}
	salt, err := b64.DecodeString(parts[4])
	if err != nil {
		return false, ErrBadHash
	}
	want, err := b64.DecodeString(parts[5])
	if err != nil || len(want) == 0 {
		return false, ErrBadHash
	}
	got := argon2.IDKey([]byte(password), salt, t, mem, p, uint32(len(want)))
	return subtle.ConstantTimeCompare(got, want) == 1, nil
}

// GeneratePassword returns a random password of 16 characters from an
// alphabet without look-alikes (no 0/O, 1/l/I), for printing once.
func GeneratePassword() string {
	const alphabet = "abcdefghijkmnopqrstuvwxyzABCDEFGHJKLMNPQRSTUVWXYZ23456789"
	b := make([]byte, 16)
	if _, err := rand.Read(b); err != nil {
		panic(err) // crypto/rand does not fail on supported platforms
	}
	for i := range b {
		b[i] = alphabet[int(b[i])%len(alphabet)]
	}
	return string(b)
}
