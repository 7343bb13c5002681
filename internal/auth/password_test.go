package auth

import (
	"strings"
	"testing"
)

func TestHashAndCheck(t *testing.T) {
	h, err := HashPassword("correct horse battery")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(h, "$argon2id$v=19$m=19456,t=2,p=1$") {
		t.Fatalf("unexpected encoding %q", h)
	}
	ok, err := CheckPassword(h, "correct horse battery")
	if err != nil || !ok {
		t.Fatalf("right password refused: ok=%v err=%v", ok, err)
	}
	ok, err = CheckPassword(h, "correct horse batterY")
	if err != nil || ok {
		t.Fatalf("wrong password accepted: ok=%v err=%v", ok, err)
	}
	h2, _ := HashPassword("correct horse battery")
	if h2 == h {
		t.Fatal("two hashes of one password are equal: salt not random")
	}
}

func TestCheckPasswordRejectsGarbage(t *testing.T) {
	for _, bad := range []string{"", "plain", "$argon2id$v=19$m=1,t=1$x$y", "$bcrypt$v=19$m=1,t=1,p=1$c2FsdA$aGFzaA", "$argon2id$v=18$m=19456,t=2,p=1$c2FsdA$aGFzaA"} {
		if ok, err := CheckPassword(bad, "x"); err == nil || ok {
			t.Errorf("CheckPassword(%q) = %v, %v; want an error", bad, ok, err)
		}
	}
}

func TestGeneratePassword(t *testing.T) {
	a, b := GeneratePassword(), GeneratePassword()
	if len(a) != 16 || a == b {
		t.Fatalf("generated %q and %q", a, b)
	}
	if strings.ContainsAny(a, "0O1lI") {
		t.Fatalf("look-alike character in %q", a)
	}
}

func FuzzCheckPassword(f *testing.F) {
	h, _ := HashPassword("seed password")
	f.Add(h, "seed password")
	f.Add("$argon2id$v=19$m=8,t=1,p=1$c2FsdA$aGFzaA", "x")
	f.Fuzz(func(t *testing.T, encoded, pw string) {
		// Must never panic, nor allocate absurd memory from a crafted hash.
		_, _ = CheckPassword(encoded, pw)
	})
}

// Passwords from the shipped list are refused whatever their case; an
// ordinary long passphrase is not. "password123" and "1234567890" are on
// every published list of common passwords (common practice).
func TestIsCommonPassword(t *testing.T) {
	for _, pw := range []string{"password123", "1234567890", "Password123", " qwertyuiop ", "1q2w3e4r5t"} {
		if !IsCommonPassword(pw) {
			t.Errorf("%q not refused", pw)
		}
	}
	for _, pw := range []string{"a long test password", "another long password", "spinach kettle orbit"} {
		if IsCommonPassword(pw) {
			t.Errorf("%q refused", pw)
		}
	}
	// The list is the length-filtered one its README describes.
	if n := strings.Count(commonList, "\n"); n != 1090 {
		t.Errorf("list has %d lines, README says 1,090", n)
	}
}
