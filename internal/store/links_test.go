package store_test

import (
	"context"
	"crypto/sha256"
	"errors"
	"testing"
	"time"

	"larder/internal/fuel"
	"larder/internal/store"
	"larder/internal/testdb"
)

func linkHash(s string) []byte { h := sha256.Sum256([]byte(s)); return h[:] }

func TestClientLinkLifecycle(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := store.Client{Name: uniq("Linked"), Sex: store.SexFemale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	now := time.Date(2027, 3, 1, 10, 0, 0, 0, time.UTC)
	l := store.ClientLink{ClientID: c.ID, TokenHash: linkHash(uniq("token")), Label: "phone", CreatedAt: now, ExpiresAt: now.AddDate(0, 0, 90)}
	if err := st.CreateClientLink(ctx, store.System, &l); err != nil {
		t.Fatal(err)
	}
	if auditCount(t, st, "client_link", l.ID) != 1 {
		t.Fatal("no audit row for the new link")
	}
	// The same hash cannot be stored twice (unique), and only a 32-byte
	// hash is accepted (the schema holds no room for a token).
	twin := l
	if err := st.CreateClientLink(ctx, store.System, &twin); err == nil {
		t.Fatal("duplicate token hash accepted")
	}
	short := store.ClientLink{ClientID: c.ID, TokenHash: []byte("plain token text"), CreatedAt: now, ExpiresAt: now.Add(time.Hour)}
	if err := st.CreateClientLink(ctx, store.System, &short); err == nil {
		t.Fatal("a non-hash token accepted")
	}

	got, err := st.OpenClientLink(ctx, l.TokenHash, now.Add(time.Hour))
	if err != nil || got.Link.ClientID != c.ID || got.Link.LastUsedAt == nil || !got.Link.LastUsedAt.Equal(now.Add(time.Hour)) {
		t.Fatalf("use: %+v %v", got, err)
	}
	if _, err := st.OpenClientLink(ctx, linkHash("unknown"), now); !errors.Is(err, store.ErrNotFound) {
		t.Fatalf("unknown hash: %v", err)
	}
	// At the expiry instant the link no longer works.
	if _, err := st.OpenClientLink(ctx, l.TokenHash, l.ExpiresAt); !errors.Is(err, store.ErrNotFound) {
		t.Fatalf("expired link: %v", err)
	}
	if s := l.Status(l.ExpiresAt); s != store.LinkExpired {
		t.Fatalf("status at expiry: %s", s)
	}

	other := store.Client{Name: uniq("Other"), Sex: store.SexMale}
	if err := st.CreateClient(ctx, store.System, &other); err != nil {
		t.Fatal(err)
	}
	if err := st.RevokeClientLink(ctx, store.System, other.ID, l.ID, now); !errors.Is(err, store.ErrNotFound) {
		t.Fatalf("revoke through another client: %v", err)
	}
	if err := st.RevokeClientLink(ctx, store.System, c.ID, l.ID, now.Add(2*time.Hour)); err != nil {
		t.Fatal(err)
	}
	if err := st.RevokeClientLink(ctx, store.System, c.ID, l.ID, now.Add(3*time.Hour)); !errors.Is(err, store.ErrLinkRevoked) {
		t.Fatalf("second revoke: %v", err)
	}
	if auditCount(t, st, "client_link", l.ID) != 2 {
		t.Fatal("want create and revoke audit rows, and nothing for the refused second revoke")
	}
	if _, err := st.OpenClientLink(ctx, l.TokenHash, now.Add(3*time.Hour)); !errors.Is(err, store.ErrNotFound) {
		t.Fatalf("revoked link: %v", err)
	}
	links, err := st.ClientLinks(ctx, c.ID)
	if err != nil || len(links) != 1 || links[0].Status(now.Add(4*time.Hour)) != store.LinkRevoked {
		t.Fatalf("list: %+v %v", links, err)
	}
	// The audit rows tie the link to its client for the client's page.
	hist, err := st.AuditForClient(ctx, c.ID, 20)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, a := range hist {
		if a.Entity == "client_link" {
			n++
		}
	}
	if n != 2 {
		t.Fatalf("client history has %d link rows, want 2", n)
	}
}

func TestPublishedPlansLeaveOutDrafts(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := store.Client{Name: uniq("Planned"), Sex: store.SexMale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	req := fuel.Request{Kind: fuel.KindWeek, StartDate: "2027-03-01", Days: 3,
		Athlete: fuel.Athlete{Sex: "male", BodyMassKg: 70}}
	plan, err := fuel.Compute(req)
	if err != nil {
		t.Fatal(err)
	}
	content := store.PlanContent{Request: req, Result: plan, BodyMassKg: 70,
		Suggestions: map[string]string{store.FeedKey("day", "2027-03-01", 0): "porridge"}}
	pub := store.Plan{ClientID: c.ID, Kind: fuel.KindWeek, Title: "Published week"}
	v, err := st.CreatePlan(ctx, store.System, &pub, content)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := st.Publish(ctx, store.System, v.ID, v.Revision, content); err != nil {
		t.Fatal(err)
	}
	draft := store.Plan{ClientID: c.ID, Kind: fuel.KindWeek, Title: "Draft week"}
	if _, err := st.CreatePlan(ctx, store.System, &draft, content); err != nil {
		t.Fatal(err)
	}
	// A revision in progress of the published plan is not shown either.
	if _, err := st.NewVersion(ctx, store.System, pub.ID, v.ID); err != nil {
		t.Fatal(err)
	}
	got, err := st.PublishedPlans(ctx, c.ID)
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 1 || got[0].Plan.ID != pub.ID || got[0].Version.Status != store.PlanPublished || got[0].Version.Version != 1 {
		t.Fatalf("published plans: %+v", got)
	}
	if got[0].Suggestions[store.FeedKey("day", "2027-03-01", 0)] != "porridge" {
		t.Fatalf("suggestions: %v", got[0].Suggestions)
	}
}

// Archiving a client stops their links at once; unarchiving brings an
// unexpired, unrevoked link back.
func TestClientLinkStopsForArchivedClient(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := store.Client{Name: uniq("Archived link"), Sex: store.SexMale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	now := time.Now()
	l := store.ClientLink{ClientID: c.ID, TokenHash: linkHash(uniq("arch")), CreatedAt: now, ExpiresAt: now.AddDate(0, 0, 30)}
	if err := st.CreateClientLink(ctx, store.System, &l); err != nil {
		t.Fatal(err)
	}
	if _, err := st.OpenClientLink(ctx, l.TokenHash, now); err != nil {
		t.Fatalf("active client's link: %v", err)
	}
	if err := st.ArchiveClient(ctx, store.System, c.ID); err != nil {
		t.Fatal(err)
	}
	if _, err := st.OpenClientLink(ctx, l.TokenHash, now); !errors.Is(err, store.ErrNotFound) {
		t.Fatalf("archived client's link still works: %v", err)
	}
	if err := st.UnarchiveClient(ctx, store.System, c.ID); err != nil {
		t.Fatal(err)
	}
	if _, err := st.OpenClientLink(ctx, l.TokenHash, now); err != nil {
		t.Fatalf("unarchived client's link: %v", err)
	}
}
