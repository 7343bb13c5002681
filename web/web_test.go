package web

import (
	"context"
	"encoding/json"
	"strings"
	"testing"
	"time"

	"larder/internal/store"
)

// The change history reads as sentences in the pages' own date style, with
// no stored action names ("publish", "revise") or ISO dates showing through.
func TestAuditText(t *testing.T) {
	entry := func(action, entity string, detail map[string]any) store.AuditEntry {
		b, err := json.Marshal(detail)
		if err != nil {
			t.Fatal(err)
		}
		return store.AuditEntry{Action: action, Entity: entity, Detail: b}
	}
	cases := []struct {
		in   store.AuditEntry
		want string
	}{
		{entry("publish", "plan", map[string]any{"version": 2}), "published plan (version 2)"},
		{entry("revise", "plan", map[string]any{"version": 3, "from_version": 2}), "started a new version of plan (version 3)"},
		{entry("discard", "plan", map[string]any{"version": 1}), "discarded plan (version 1)"},
		{entry("create", "food", map[string]any{"name": "Honey"}), "created food (Honey)"},
		{entry("create", "body_mass", map[string]any{"measured_on": "2027-02-20"}), "created a body-mass measurement (Sat 20 Feb 2027)"},
		{entry("update", "training", map[string]any{"on_date": "2027-02-21", "modality": "run"}), "changed a training session (Sun 21 Feb 2027 Running)"},
		{entry("sign_in", "user", nil), "signed in"},
	}
	for _, c := range cases {
		if got := AuditText(c.in); got != c.want {
			t.Errorf("AuditText(%s %s) = %q, want %q", c.in.Action, c.in.Entity, got, c.want)
		}
	}
}

func TestUTCStampAndOneDecimal(t *testing.T) {
	at := time.Date(2026, 12, 2, 1, 28, 0, 0, time.FixedZone("CET", 3600))
	if got := UTCStamp(at); got != "Wed 2 Dec 2026 00:28" {
		t.Errorf("UTCStamp = %q", got)
	}
	for in, want := range map[float64]string{58: "58.0", 58.14: "58.1", 68.04: "68.0", 92.75: "92.8"} {
		if got := OneDecimal(in); got != want {
			t.Errorf("OneDecimal(%v) = %q, want %q", in, got, want)
		}
	}
}

// The delete box names the history as the client page does ("Recent
// changes"), not by its storage name.
func TestDeleteFormWords(t *testing.T) {
	var b strings.Builder
	if err := deleteForm("/clients/1/body-mass/2/delete", "this measurement").Render(context.Background(), &b); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "Recent changes on the client page still show that it was deleted.") || strings.Contains(strings.ToLower(b.String()), "audit") {
		t.Errorf("delete form reads %q", b.String())
	}
}

// The zone choices read like the activity choices: "Endurance", not "endurance".
func TestZoneChoicesCapitalised(t *testing.T) {
	got := Zones()
	if len(got) != len(store.Zones)+1 || got[0].Value != "" {
		t.Fatalf("Zones() = %v", got)
	}
	for i, z := range store.Zones {
		if o := got[i+1]; o.Value != z || o.Label != strings.ToUpper(z[:1])+z[1:] {
			t.Errorf("choice %d = %+v for zone %q", i+1, o, z)
		}
	}
	if got[2].Label != "Endurance" {
		t.Errorf("second zone reads %q", got[2].Label)
	}
}

// Path joins strings and ids of either integer type as the routes spell
// them, and other values as fmt prints them.
func TestPath(t *testing.T) {
	cases := []struct {
		got, want string
	}{
		{Path("clients", int64(42), "body-mass", int64(7), "edit"), "/clients/42/body-mass/7/edit"},
		{Path("clients", int64(3), "plans", int64(9), "versions", 2), "/clients/3/plans/9/versions/2"},
		{Path("team", int64(-1)), "/team/-1"},
		{Path("x", 1.5, true), "/x/1.5/true"},
		{Path(), ""},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("Path = %q, want %q", c.got, c.want)
		}
	}
}

// An event's start shows in its own zone, loaded once and then kept: the
// offsets are the IANA tz database's (Berlin is UTC+2 in summer time, UTC+1
// in winter; Sydney UTC+10 in June). A zone the machine does not know shows
// the UTC time under the recorded name, and is not kept.
func TestDateTimeZone(t *testing.T) {
	summer := time.Date(2027, 4, 18, 6, 30, 0, 0, time.UTC)
	winter := time.Date(2027, 1, 10, 6, 30, 0, 0, time.UTC)
	for range 2 { // the second round is served from the kept zones
		if got, want := DateTimeZone(summer, "Europe/Berlin"), "Sun 18 Apr 2027 08:30 (Europe/Berlin)"; got != want {
			t.Errorf("summer: %q, want %q", got, want)
		}
		if got, want := DateTimeZone(winter, "Europe/Berlin"), "Sun 10 Jan 2027 07:30 (Europe/Berlin)"; got != want {
			t.Errorf("winter: %q, want %q", got, want)
		}
		if got, want := DateIn(time.Date(2027, 6, 5, 20, 0, 0, 0, time.UTC), "Australia/Sydney"), "Sun 6 Jun 2027"; got != want {
			t.Errorf("Sydney: %q, want %q", got, want)
		}
		if got, want := DateTimeZone(summer, "Not/A_Zone"), "Sun 18 Apr 2027 06:30 (Not/A_Zone)"; got != want {
			t.Errorf("unknown zone: %q, want %q", got, want)
		}
	}
	if _, kept := zones.Load("Not/A_Zone"); kept {
		t.Error("a zone that did not load was kept")
	}
	if _, kept := zones.Load("Europe/Berlin"); !kept {
		t.Error("Europe/Berlin was not kept after loading")
	}
}
