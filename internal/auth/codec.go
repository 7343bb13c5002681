package auth

import (
	"bytes"
	"encoding/binary"
	"errors"
	"time"

	"github.com/alexedwards/scs/v2"
)

// codec stores a session's values in a small binary form of its own
// instead of scs's gob: every staff request decodes its session, and gob
// builds a decoder for the map's types on each call (a twentieth of the
// client page's processor time in its profile). Sessions hold only int64s
// and strings (the keys above); a session holding any other type is written
// with gob, and rows written with gob (before this codec, or with such a
// value) are still read with it, so no one is signed out by the change.
type codec struct{}

// codecMagic starts every session this codec writes. A gob stream never
// starts with a zero byte (its first message's length is at least one).
const codecMagic = "\x00LS1"

const (
	tagInt64  = 'i'
	tagString = 's'
)

var errBadSession = errors.New("auth: damaged session data")

func (codec) Encode(deadline time.Time, values map[string]any) ([]byte, error) {
	b := make([]byte, 0, 64)
	b = append(b, codecMagic...)
	b = binary.AppendVarint(b, deadline.UnixNano())
	b = binary.AppendUvarint(b, uint64(len(values)))
	for k, v := range values {
		b = binary.AppendUvarint(b, uint64(len(k)))
		b = append(b, k...)
		switch v := v.(type) {
		case int64:
			b = append(b, tagInt64)
			b = binary.AppendVarint(b, v)
		case string:
			b = append(b, tagString)
			b = binary.AppendUvarint(b, uint64(len(v)))
			b = append(b, v...)
		default:
			return scs.GobCodec{}.Encode(deadline, values)
		}
	}
	return b, nil
}

func (codec) Decode(b []byte) (time.Time, map[string]any, error) {
	if !bytes.HasPrefix(b, []byte(codecMagic)) {
		return scs.GobCodec{}.Decode(b)
	}
	b = b[len(codecMagic):]
	ns, n := binary.Varint(b)
	if n <= 0 {
		return time.Time{}, nil, errBadSession
	}
	b = b[n:]
	count, n := binary.Uvarint(b)
	if n <= 0 || count > uint64(len(b)) {
		return time.Time{}, nil, errBadSession
	}
	b = b[n:]
	// bytesOf takes a length-prefixed run of bytes off b.
	bytesOf := func() (string, bool) {
		l, n := binary.Uvarint(b)
		if n <= 0 || l > uint64(len(b)-n) {
			return "", false
		}
		s := string(b[n : n+int(l)])
		b = b[n+int(l):]
		return s, true
	}
	values := make(map[string]any, count)
	for range count {
		k, ok := bytesOf()
		if !ok || len(b) == 0 {
			return time.Time{}, nil, errBadSession
		}
		tag := b[0]
		b = b[1:]
		switch tag {
		case tagInt64:
			v, n := binary.Varint(b)
			if n <= 0 {
				return time.Time{}, nil, errBadSession
			}
			b = b[n:]
			values[k] = v
		case tagString:
			v, ok := bytesOf()
			if !ok {
				return time.Time{}, nil, errBadSession
			}
			values[k] = v
		default:
			return time.Time{}, nil, errBadSession
		}
	}
	if len(b) != 0 {
		return time.Time{}, nil, errBadSession
	}
	return time.Unix(0, ns), values, nil
}
