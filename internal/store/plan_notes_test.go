package store_test

import (
	"context"
	"testing"

	"larder/internal/fuel"
	"larder/internal/store"
	"larder/internal/testdb"
)

// Notes to the athlete are kept with the version: saved with a draft, kept
// by a save that does not carry them, frozen once published (the database
// refuses an edit), carried into the next version and seen from the link.
func TestPlanNotesKeptWithTheVersion(t *testing.T) {
	ctx := context.Background()
	pool := testdb.Pool(t)
	st := store.New(pool)
	c := store.Client{Name: uniq("Noted Athlete"), Sex: store.SexFemale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	req := fuel.Request{Kind: fuel.KindWeek, StartDate: "2027-05-03", Days: 3, Athlete: fuel.Athlete{Sex: "female", BodyMassKg: 58}}
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: 58}
	p := store.Plan{ClientID: c.ID, Kind: fuel.KindWeek, Title: "Week with notes"}
	v, err := st.CreatePlan(ctx, store.System, &p, content)
	if err != nil {
		t.Fatal(err)
	}
	if !v.Notes.Empty() {
		t.Fatalf("a new plan has notes: %+v", v.Notes)
	}
	notes := store.PlanNotes{Plan: "Eat breakfast before the early sessions.", Days: map[string]string{"2027-05-04": "Long ride: take the bottles you practised with."}}
	content.Notes = &notes
	if v, err = st.SaveDraft(ctx, store.System, v.ID, v.Revision, content); err != nil {
		t.Fatal(err)
	}
	if v.Notes.Plan != notes.Plan || v.Notes.Day("2027-05-04") != notes.Days["2027-05-04"] || v.Notes.Day("2027-05-03") != "" {
		t.Fatalf("saved notes: %+v", v.Notes)
	}
	content.Notes = nil // a save that does not carry notes keeps them
	if v, err = st.Publish(ctx, store.System, v.ID, v.Revision, content); err != nil {
		t.Fatal(err)
	}
	if v.Notes.Plan != notes.Plan {
		t.Fatalf("notes after publishing: %+v", v.Notes)
	}
	if _, err := pool.Exec(ctx, `UPDATE plan_versions SET athlete_notes = '{"plan": "changed"}' WHERE id = $1`, v.ID); err == nil {
		t.Error("the notes of a published version were changed")
	}
	got, err := st.PublishedPlanVersion(ctx, p.ID)
	if err != nil || got.Notes.Plan != notes.Plan || got.Notes.Day("2027-05-04") != notes.Days["2027-05-04"] {
		t.Fatalf("published version's notes: %+v %v", got.Notes, err)
	}
	fv, err := st.FrozenVersionByID(ctx, v.ID)
	if err != nil || fv.Version.Notes.Plan != notes.Plan {
		t.Fatalf("frozen version's notes: %+v %v", fv, err)
	}
	next, err := st.NewVersion(ctx, store.System, p.ID, v.ID)
	if err != nil || next.Notes.Plan != notes.Plan || next.Notes.Day("2027-05-04") != notes.Days["2027-05-04"] {
		t.Fatalf("the new version's notes: %+v %v", next.Notes, err)
	}
	// The draft's notes can change again; the published version's stay.
	content.Notes = &store.PlanNotes{Plan: "New words."}
	if next, err = st.SaveDraft(ctx, store.System, next.ID, next.Revision, content); err != nil || next.Notes.Plan != "New words." || len(next.Notes.Days) != 0 {
		t.Fatalf("draft notes changed: %+v %v", next.Notes, err)
	}
	if got, err := st.PublishedPlanVersion(ctx, p.ID); err != nil || got.Notes.Plan != notes.Plan {
		t.Fatalf("published notes after the draft changed: %+v %v", got.Notes, err)
	}
}
