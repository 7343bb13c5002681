package server

import (
	"net/url"
	"regexp"
	"strings"
	"testing"

	"larder/internal/store"
	"larder/web"
)

// A week plan, then a plan for two of its days published later (a
// race-day plan made after a loading plan, say): before those days come,
// the phone page's days ahead give them from the later plan, with its
// grams and its note to the athlete, as the calendar does; the days around
// them stay the first plan's.
func TestClientLinkDaysAheadFromThePlanThatOwnsThem(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c := a.newClient(unique("Ada Ahead"))
	_, week := storePlan(t, a, c.ID, "Week plan", weekRequest("2027-03-01", 7), true, "")
	heavier := weekRequest("2027-03-03", 2)
	heavier.Athlete.BodyMassKg = 80
	p2, later := storePlan(t, a, c.ID, "Two days redone", heavier, false, "")
	edit := "/clients/" + itoa(c.ID) + "/plans/" + itoa(p2.ID) + "/versions/1"
	b.post(edit, url.Values{"revision": {"1"}, "action": {"publish"}, "note_day_2027-03-03": {"Wednesday: the later plan's note."}}).
		mustRedirect(t, edit)
	if week.Days[2].ChoG == later.Days[0].ChoG {
		t.Fatalf("both plans give %v g on 3 Mar: nothing tells them apart", later.Days[0].ChoG)
	}
	token := makeLink(t, b, c.ID, "")

	// The clock reads Mon 1 Mar 2027: the days ahead are 2 to 5 Mar.
	_, page := getPublic(t, a, "/c/"+token)
	list := regexp.MustCompile(`(?s)<ul class="next" id="next-days">(.*?)</ul>`).FindStringSubmatch(page)
	if list == nil {
		t.Fatalf("no days ahead on the phone page:\n%s", page)
	}
	items := strings.Split(list[1], "<li")[1:]
	want := []struct {
		date  string
		choG  float64
		extra string
	}{
		{"2027-03-02", week.Days[1].ChoG, ""},
		{"2027-03-03", later.Days[0].ChoG, "Wednesday: the later plan&#39;s note."},
		{"2027-03-04", later.Days[1].ChoG, ""},
		{"2027-03-05", week.Days[4].ChoG, ""},
	}
	if len(items) != len(want) {
		t.Fatalf("%d days ahead, want %d:\n%s", len(items), len(want), list[1])
	}
	for i, w := range want {
		for _, part := range []string{dayWords(w.date), web.Num(w.choG, 0) + " g carbohydrate", w.extra} {
			if !strings.Contains(items[i], part) {
				t.Errorf("day ahead %d (%s) lacks %q:\n%s", i+1, w.date, part, items[i])
			}
		}
	}
}
