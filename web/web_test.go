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
