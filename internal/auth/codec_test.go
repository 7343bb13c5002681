package auth

import (
	"reflect"
	"testing"
	"time"

	"github.com/alexedwards/scs/v2"
)

// A signed-in session's values come back as they were put, with their
// types (GetInt64 and GetString assert them), and its deadline to the
// nanosecond.
func TestCodecRoundTrip(t *testing.T) {
	deadline := time.Date(2027, 3, 1, 22, 0, 0, 123456789, time.UTC)
	values := map[string]any{KeyUserID: int64(42), KeySessionID: int64(-7), KeySeen: int64(1_800_000_000),
		KeyFlash: "Client Ada Lindqvist added. — ok", "empty": ""}
	b, err := codec{}.Encode(deadline, values)
	if err != nil {
		t.Fatal(err)
	}
	if string(b[:len(codecMagic)]) != codecMagic {
		t.Fatalf("not written in the codec's own form: % x", b[:8])
	}
	gotDeadline, got, err := codec{}.Decode(b)
	if err != nil {
		t.Fatal(err)
	}
	if !gotDeadline.Equal(deadline) || !reflect.DeepEqual(got, values) {
		t.Fatalf("decoded %v %#v, want %v %#v", gotDeadline, got, deadline, values)
	}
}

// Sessions written by scs's gob codec (every session before this codec)
// are still read, and a value of another type is written with gob.
func TestCodecReadsAndWritesGob(t *testing.T) {
	deadline := time.Date(2027, 3, 1, 22, 0, 0, 0, time.UTC)
	old := map[string]any{KeyUserID: int64(5), KeySessionID: int64(9), KeyFlash: "Saved."}
	b, err := scs.GobCodec{}.Encode(deadline, old)
	if err != nil {
		t.Fatal(err)
	}
	gotDeadline, got, err := codec{}.Decode(b)
	if err != nil || !gotDeadline.Equal(deadline) || !reflect.DeepEqual(got, old) {
		t.Fatalf("gob session read as %v %#v, %v", gotDeadline, got, err)
	}
	other := map[string]any{KeyUserID: int64(5), "remember": true}
	b, err = codec{}.Encode(deadline, other)
	if err != nil {
		t.Fatal(err)
	}
	if string(b[:len(codecMagic)]) == codecMagic {
		t.Fatal("a bool was written in the codec's own form, which has no bools")
	}
	if _, got, err := (codec{}).Decode(b); err != nil || !reflect.DeepEqual(got, other) {
		t.Fatalf("gob fallback read as %#v, %v", got, err)
	}
}

// Damaged or cut session data is an error, never a panic or a session
// with made-up values.
func TestCodecRefusesDamage(t *testing.T) {
	b, err := codec{}.Encode(time.Now(), map[string]any{KeyUserID: int64(300), KeyFlash: "Saved."})
	if err != nil {
		t.Fatal(err)
	}
	for n := len(codecMagic); n < len(b); n++ {
		if _, _, err := (codec{}).Decode(b[:n]); err == nil {
			t.Errorf("data cut to %d of %d bytes decoded without error", n, len(b))
		}
	}
	if _, _, err := (codec{}).Decode(append(b[:len(b):len(b)], 0)); err == nil {
		t.Error("data with a trailing byte decoded without error")
	}
}

func FuzzCodecDecode(f *testing.F) {
	b, _ := codec{}.Encode(time.Now(), map[string]any{KeyUserID: int64(1), KeyFlash: "x"})
	f.Add(b)
	f.Add([]byte(codecMagic))
	f.Fuzz(func(t *testing.T, b []byte) {
		deadline, values, err := codec{}.Decode(b)
		if err != nil {
			return
		}
		// Whatever decodes must encode and decode to the same values.
		again, err := codec{}.Encode(deadline, values)
		if err != nil {
			t.Fatal(err)
		}
		d2, v2, err := codec{}.Decode(again)
		if err != nil || !d2.Equal(deadline) || !reflect.DeepEqual(v2, values) {
			t.Fatalf("%#v decoded again as %#v, %v", values, v2, err)
		}
	})
}

// BenchmarkSessionDecode compares the codec with scs's gob on a signed-in
// session's values, as each staff request decodes them.
func BenchmarkSessionDecode(b *testing.B) {
	values := map[string]any{KeyUserID: int64(42), KeySessionID: int64(1234), KeySeen: int64(1_800_000_000)}
	deadline := time.Now().Add(SessionLifetime)
	for _, c := range []struct {
		name  string
		codec scs.Codec
	}{{"own", codec{}}, {"gob", scs.GobCodec{}}} {
		data, err := c.codec.Encode(deadline, values)
		if err != nil {
			b.Fatal(err)
		}
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				if _, _, err := c.codec.Decode(data); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
