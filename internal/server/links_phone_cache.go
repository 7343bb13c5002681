package server

import (
	"strconv"
	"time"

	lru "github.com/hashicorp/golang-lru/v2"

	"larder/internal/store"
)

// The phone page is the same bytes for every view of one link on one day
// until the dietitian changes something it shows, and a client reloads it
// all day. Its rendered body is kept by phonePageKey, a key made of every
// input of clientDayView; the link's own query still runs on every view
// (revoked, expired and archived stop at once, and the key is built from
// what it read just now), only the building and rendering are saved.

// phonePageCacheSize bounds the phone pages kept in memory: a page is a
// few KB (tens with a race day's blocks), so a full cache is a few MB.
const phonePageCacheSize = 512

func newPhonePageCache() *lru.Cache[string, []byte] {
	c, err := lru.New[string, []byte](phonePageCacheSize)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return c
}

// phonePageKey names everything clientDayView reads: the page's path (the
// calendar and sheet links carry the token), the client's first name,
// shared note, figures setting and body-mass unit, the practice's name,
// today's date in UTC and, for each published plan in order, its id,
// title, last change, event name, frozen version and today's date in the
// plan's own zone (the page leads with that day's fuelling, and a zone
// east or west of UTC turns the day at another hour). A published version
// never changes (a trigger freezes it, notes included), so its id stands
// for its figures, food ideas, notes and zone. Strings are quoted, so no
// two different inputs give one key. An input added to clientDayView must
// be added here, with a test in links_phone_cache_test.go that changes it
// from outside and sees it on the next view.
func phonePageKey(path string, o store.LinkOpen, plans []linkPlan, now time.Time) string {
	b := make([]byte, 0, 256)
	b = strconv.AppendQuote(b, path)
	b = strconv.AppendQuote(b, o.ClientName)
	b = strconv.AppendQuote(b, o.SharedNote)
	b = strconv.AppendBool(b, o.ShowFigures)
	b = strconv.AppendQuote(b, string(o.MassUnit))
	b = strconv.AppendQuote(b, o.PracticeName)
	b = now.UTC().AppendFormat(b, time.DateOnly)
	for _, p := range plans {
		b = append(b, '|')
		b = strconv.AppendInt(b, p.Plan.ID, 10)
		b = strconv.AppendQuote(b, p.Plan.Title)
		b = strconv.AppendInt(b, p.Plan.UpdatedAt.UnixNano(), 10)
		b = strconv.AppendQuote(b, p.eventName)
		b = append(b, ':')
		b = strconv.AppendInt(b, p.Version.ID, 10)
		b = append(b, ':')
		b = now.In(p.loc).AppendFormat(b, time.DateOnly)
	}
	return string(b)
}
