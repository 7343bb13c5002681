package server

import (
	"context"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"larder/internal/menu"
	"larder/internal/sheet/sheettest"
	"larder/internal/store"
)

// A food choice on a feed that a change of the plan takes away is set
// aside: the plan page names it, no view the athlete reads shows it, and the
// dietitian removes it from the draft. A choice on a feed still in the plan
// cannot be removed this way.
func TestFeedChoiceSetAsideWhenItsFeedGoes(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, pid := loadingPlan(t, a, b)
	ctx := context.Background()
	base := "/clients/" + itoa64(cid) + "/plans/" + itoa64(pid)
	v := latestVersion(t, a, pid)
	day := v.Result.Days[0]
	if len(day.Feeds) < 3 {
		t.Fatalf("first day has %d feeds; the test needs 3 or more", len(day.Feeds))
	}
	last := len(day.Feeds) - 1
	lastKey := menu.FeedKey("day", day.Date, last)
	firstKey := menu.FeedKey("day", day.Date, 0)
	for _, i := range []int{0, last} {
		v = latestVersion(t, a, pid)
		b.post(feedFoodPath(cid, pid, 1, day.Date, i), url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"},
			"free_0": {"toast and honey " + strconv.Itoa(i)}, "freecho_0": {"30"}}).mustRedirect(t, base+"/versions/1")
	}
	if strings.Contains(b.get(base+"/versions/1").body, `id="set-aside-choices"`) {
		t.Fatal("choices set aside before any change of the plan")
	}

	// One eating occasion on that day: its later feeds go.
	v = latestVersion(t, a, pid)
	b.post(base+"/versions/1", url.Values{"revision": {strconv.Itoa(v.Revision)}, "action": {"save"}, occName(day.Date): {"1"}}).
		mustRedirect(t, base+"/versions/1")
	v = latestVersion(t, a, pid)
	for _, d := range v.Result.Days {
		if d.Date == day.Date && len(d.Feeds) > last {
			t.Fatalf("day still has %d feeds after the change; the test needs feed %d gone", len(d.Feeds), last+1)
		}
	}
	choices, err := a.st.FeedChoices(ctx, v.ID)
	if err != nil || len(choices[lastKey]) != 1 {
		t.Fatalf("the choice is not kept with the version: %v %+v", err, choices)
	}
	page := b.get(base + "/versions/1")
	want := "Your choice for feed " + strconv.Itoa(last+1) + " of " + dayWords(day.Date) + " no longer matches a feed: toast and honey " + strconv.Itoa(last) + " (30 g carbohydrate)."
	page.mustContain(t, `id="set-aside-choices"`, want, `name="feed" value="`+lastKey+`"`)
	if strings.Contains(page.body, "no longer matches a feed: toast and honey 0") {
		t.Error("a choice whose feed is still there is listed as set aside")
	}

	// What the athlete's views read (phone page, calendar, sheets): not there.
	stored, err := a.st.FeedSuggestions(ctx, v.ID)
	if err != nil {
		t.Fatal(err)
	}
	for key, text := range stored {
		if strings.Contains(text, "toast and honey "+strconv.Itoa(last)) {
			t.Errorf("the set-aside choice shows on %s: %q", key, text)
		}
	}
	for _, form := range []string{"staff", "athlete"} {
		res := b.get(base + "/versions/1/sheet.pdf?form=" + form)
		if res.status != http.StatusOK {
			t.Fatalf("%s sheet: %d", form, res.status)
		}
		if text, ok := sheettest.Text(t, []byte(res.body)); ok && strings.Contains(text, "toast and honey "+strconv.Itoa(last)) {
			t.Errorf("the %s sheet prints the set-aside choice", form)
		}
	}

	// A stale page removes nothing; a live feed's choice is not removed.
	removeURL := base + "/versions/1/set-aside-choices"
	b.post(removeURL, url.Values{"revision": {strconv.Itoa(v.Revision - 1)}, "feed": {lastKey}}).mustRedirect(t, base+"/versions/1")
	b.post(removeURL, url.Values{"revision": {strconv.Itoa(v.Revision)}, "feed": {firstKey}}).mustRedirect(t, base+"/versions/1")
	if c, _ := a.st.FeedChoices(ctx, v.ID); len(c[lastKey]) != 1 || len(c[firstKey]) != 1 {
		t.Fatalf("choices after a stale and a wrong removal: %+v", c)
	}
	b.post(removeURL, url.Values{"revision": {strconv.Itoa(v.Revision)}, "feed": {lastKey}}).mustRedirect(t, base+"/versions/1")
	c, _ := a.st.FeedChoices(ctx, v.ID)
	if len(c[lastKey]) != 0 || len(c[firstKey]) != 1 {
		t.Fatalf("after removing: %+v", c)
	}
	page = b.get(base + "/versions/1")
	page.mustContain(t, "The set-aside food choice is removed.")
	if strings.Contains(page.body, `id="set-aside-choices"`) {
		t.Error("the removed choice is still listed")
	}
	if got := latestVersion(t, a, pid); got.Revision != v.Revision+1 {
		t.Errorf("revision %d after the removal, want %d", got.Revision, v.Revision+1)
	}
}
