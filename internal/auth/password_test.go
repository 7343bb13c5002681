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
