package server

import (
	"context"
	"fmt"
	"html"
	"net/http/httptest"
	"net/url"
	"regexp"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"larder/internal/demo"
	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/sheet"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
	"larder/internal/testdb"
)

// TestOneFoodPlanPerFeedOnEverySurface loads the demo practice and, for
// every demo plan, reads each feed's stored food plan and finds the same
// words in that feed's place on the plan page, the plan sheet in both its
// forms (the dietitian's and the athlete's), the client's calendar and the
// client's phone page (a clock set to each day of the plan). A feed listed twice — the pre-event meal or a repletion feed that
// is also a feed of its day — must carry one food plan, not two.
func TestOneFoodPlanPerFeedOnEverySurface(t *testing.T) {
	var clock atomic.Int64
	clock.Store(testNow.UnixNano())
	// A database of its own: other tests publish plans for the demo
	// clients in the shared one, and the latest published plan owns a day
	// on the phone page and in the calendar.
	pool, _ := testdb.Empty(t)
	if _, err := store.Migrate(context.Background(), pool); err != nil {
		t.Fatal(err)
	}
	st := store.New(pool)
	s := New(Config{Store: st, SessionCleanup: -1, Now: func() time.Time { return time.Unix(0, clock.Load()).UTC() }})
	hs := httptest.NewServer(s)
	t.Cleanup(func() { hs.Close(); s.Close() })
	a := &app{t: t, st: st, srv: hs}
	res := loadDemo(t, a)
	b := a.browser()
	b.post("/signin", url.Values{"email": {demo.Email}, "password": {res.Password}}).mustRedirect(t, "/")

	ctx := context.Background()
	rows, err := st.Pool.Query(ctx, `SELECT p.client_id, p.id, p.kind FROM plans p WHERE p.created_by IS NULL ORDER BY p.id`)
	if err != nil {
		t.Fatal(err)
	}
	type demoPlan struct {
		clientID, planID int64
		kind             string
	}
	var plans []demoPlan
	for rows.Next() {
		var p demoPlan
		if err := rows.Scan(&p.clientID, &p.planID, &p.kind); err != nil {
			t.Fatal(err)
		}
		plans = append(plans, p)
	}
	rows.Close()
	if len(plans) < 4 {
		t.Fatalf("want the four demo plans, got %d", len(plans))
	}
	kinds := map[string]bool{}
	tokens := map[int64]string{}
	for _, dp := range plans {
		kinds[dp.kind] = true
		v, err := st.PublishedPlanVersion(ctx, dp.planID)
		if err != nil {
			t.Fatal(err)
		}
		stored, err := st.FeedSuggestions(ctx, v.ID)
		if err != nil {
			t.Fatal(err)
		}
		plan := v.Result
		loc := loadZone(plan.TimeZone)
		name := fmt.Sprintf("%s plan %d", dp.kind, dp.planID)

		// The stored rows: every feed of every day has its food plan, and
		// a feed listed twice has the same one under both keys.
		byTime := map[int64]string{}
		feeds := 0
		for _, d := range plan.Days {
			for i, f := range d.Feeds {
				text, ok := stored[menu.FeedKey("day", d.Date, i)]
				if !ok && f.ChoG > 0 {
					t.Errorf("%s: feed %s #%d (%s) has no stored food plan", name, d.Date, i, f.Label)
				}
				byTime[f.At.UnixNano()] = text
				feeds++
			}
		}
		twice := func(kind string, at time.Time, i int) {
			key := menu.FeedKey(kind, menu.FeedDate(plan, at), i)
			if day, listed := byTime[at.UnixNano()]; listed && stored[key] != day {
				t.Errorf("%s: %s says %q, the same feed in the day table says %q", name, key, stored[key], day)
			}
		}
		if m := plan.PreEventMeal; m != nil {
			twice("pre_event", m.At, 0)
		}
		if r := plan.Repletion; r != nil {
			for i, f := range r.Feeds {
				twice("repletion", f.At, i)
			}
		}

		// The plan page: each feed's row (data-feed) shows its stored text.
		page := b.get(fmt.Sprintf("/clients/%d/plans/%d/versions/%d", dp.clientID, dp.planID, v.Version))
		for key, text := range stored {
			if strings.HasPrefix(key, "pre_event:") {
				if !strings.Contains(page.body, "For example: "+html.EscapeString(text)) {
					t.Errorf("%s: plan page's pre-event card lacks %q", name, text)
				}
				continue
			}
			row := rowOf(page.body, "tr", key)
			if row == "" {
				t.Errorf("%s: plan page has no row for %s", name, key)
			} else if !strings.Contains(row, html.EscapeString(text)) {
				t.Errorf("%s: plan page row %s lacks %q:\n%s", name, key, text, row)
			}
		}

		// The sheet: each day feed's text follows its time and label.
		pdf := b.get(fmt.Sprintf("/clients/%d/plans/%d/sheet.pdf", dp.clientID, dp.planID))
		if text, ok := sheettest.Text(t, []byte(pdf.body)); ok {
			folded := fold(text)
			for _, d := range plan.Days {
				for i, f := range d.Feeds {
					sg := stored[menu.FeedKey("day", d.Date, i)]
					if sg == "" {
						continue
					}
					head := f.At.In(loc).Format("15:04") + " " + sheet.FeedLabel(plan, f)
					if !followedBy(folded, head, fold(sg)) {
						t.Errorf("%s: sheet has no %q followed by its food plan %q", name, head, sg)
					}
				}
			}
		}

		// The athlete's sheet: under each day's heading, each feed's time
		// is followed by its food plan (a feed the foods could not fill
		// prints no food).
		apdf := b.get(fmt.Sprintf("/clients/%d/plans/%d/sheet.pdf?form=athlete", dp.clientID, dp.planID))
		if text, ok := sheettest.Text(t, []byte(apdf.body)); ok {
			folded := fold(text)
			heading := func(date string) string {
				d, _ := time.Parse(time.DateOnly, date)
				return d.Format("Mon 2 Jan") + " · "
			}
			for di, d := range plan.Days {
				start := strings.Index(folded, heading(d.Date))
				if start < 0 {
					t.Errorf("%s: athlete's sheet has no heading for %s", name, d.Date)
					continue
				}
				section := folded[start:]
				if di+1 < len(plan.Days) {
					if end := strings.Index(section, heading(plan.Days[di+1].Date)); end > 0 {
						section = section[:end]
					}
				}
				for i, f := range d.Feeds {
					sg := stored[menu.FeedKey("day", d.Date, i)]
					if sg == "" || sg == menu.NoFit {
						continue
					}
					if at := f.At.In(loc).Format("15:04"); !followedBy(section, at, fold(sg)) {
						t.Errorf("%s: athlete's sheet, %s: no %s followed by its food plan %q", name, d.Date, at, sg)
					}
				}
			}
		}

		// The client link: a link per client, made once.
		if tokens[dp.clientID] == "" {
			tokens[dp.clientID] = makeLink(t, b, dp.clientID, "feeds check")
		}
		token := tokens[dp.clientID]
		owned := 0
		for _, d := range plan.Days {
			// The phone page on that day, at noon in the plan's zone.
			day, _ := time.ParseInLocation(time.DateOnly, d.Date, loc)
			clock.Store(day.Add(12 * time.Hour).UnixNano())
			_, phone := getPublic(t, a, "/c/"+token)
			_, cal := getPublic(t, a, "/c/"+token+"/plan.ics")
			events := icsEvents(cal)
			for i, f := range d.Feeds {
				key := menu.FeedKey("day", d.Date, i)
				sg := stored[key]
				row := rowOf(phone, "li", key)
				if row == "" {
					continue // another plan published later owns this day
				}
				owned++
				if sg != menu.NoFit && !strings.Contains(row, html.EscapeString(sg)) {
					t.Errorf("%s: phone page row %s lacks %q:\n%s", name, key, sg, row)
				}
				if f.Label == "during event" {
					continue // the calendar carries it on the event itself
				}
				desc, ok := events[fmt.Sprintf("plan-%d-%s-feed-%d@larder", dp.planID, d.Date, i)]
				switch {
				case !ok:
					t.Errorf("%s: calendar has no entry for %s", name, key)
				case sg != menu.NoFit && !strings.Contains(desc, "For example: "+sg):
					t.Errorf("%s: calendar entry %s lacks %q:\n%s", name, key, sg, desc)
				}
			}
		}
		if owned == 0 {
			t.Errorf("%s: no feed of it reached the phone page", name)
		}
		t.Logf("%s: %d feeds compared on %d surfaces", name, feeds, 5)
	}
	for _, k := range []string{fuel.KindLoading, fuel.KindRace, fuel.KindRepletion, fuel.KindWeek} {
		if !kinds[k] {
			t.Errorf("no demo plan of kind %s", k)
		}
	}
}

// rowOf returns the element (tr or li) whose data-feed is key, up to its
// closing tag.
func rowOf(page, tag, key string) string {
	re := regexp.MustCompile(`(?s)<` + tag + `[^>]*data-feed="` + regexp.QuoteMeta(key) + `"[^>]*>.*?</` + tag + `>`)
	return re.FindString(page)
}

// fold collapses white space, as pdftotext wraps lines wherever a cell does.
func fold(s string) string { return strings.Join(strings.Fields(s), " ") }

// followedBy tells whether want comes after head, before the next feed row
// would begin (within a few hundred characters).
func followedBy(text, head, want string) bool {
	for from := 0; ; {
		i := strings.Index(text[from:], head)
		if i < 0 {
			return false
		}
		at := from + i + len(head)
		end := min(len(text), at+len(want)+200)
		if strings.Contains(text[at:end], want) {
			return true
		}
		from = at
	}
}

// icsEvents maps each VEVENT's UID to its description, unescaped.
func icsEvents(stream string) map[string]string {
	out := map[string]string{}
	var uid, desc string
	unescape := strings.NewReplacer(`\n`, "\n", `\N`, "\n", `\,`, ",", `\;`, ";", `\\`, `\`)
	for _, l := range sheet.ICSUnfold(stream) {
		name, value, _ := strings.Cut(l, ":")
		switch {
		case l == "BEGIN:VEVENT":
			uid, desc = "", ""
		case name == "UID":
			uid = value
		case name == "DESCRIPTION":
			desc = unescape.Replace(value)
		case l == "END:VEVENT":
			out[uid] = desc
		}
	}
	return out
}
