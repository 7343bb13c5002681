package store_test

import (
	"context"
	"errors"
	"fmt"
	"os"
	"strings"
	"sync"
	"testing"
	"time"

	"larder/internal/store"
	"larder/internal/testdb"
)

func TestMain(m *testing.M) { os.Exit(testdb.Main(m)) }

var n int

func uniq(s string) string {
	n++
	return fmt.Sprintf("%s %d-%d", s, time.Now().UnixNano()%1e9, n)
}

func auditCount(t *testing.T, st *store.Store, entity string, id int64) int {
	t.Helper()
	var c int
	if err := st.Pool.QueryRow(context.Background(), `SELECT count(*) FROM audit_log WHERE entity = $1 AND entity_id = $2`, entity, id).Scan(&c); err != nil {
		t.Fatal(err)
	}
	return c
}

func TestUsersEmailUniqueIgnoringCase(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	email := fmt.Sprintf("case%d@Example.org", time.Now().UnixNano())
	u := store.User{Email: email, Name: "A", PasswordHash: "h", Role: store.RoleDietitian}
	if err := st.CreateUser(ctx, store.System, &u); err != nil {
		t.Fatal(err)
	}
	twin := store.User{Email: strings.ToUpper(email), Name: "B", PasswordHash: "h", Role: store.RoleDietitian}
	if err := st.CreateUser(ctx, store.System, &twin); !errors.Is(err, store.ErrEmailTaken) {
		t.Fatalf("same email in other case: %v", err)
	}
	got, err := st.UserByEmail(ctx, " "+email+" ")
	if err != nil || got.ID != u.ID {
		t.Fatalf("lookup ignoring case/space: %+v %v", got, err)
	}
	if auditCount(t, st, "user", u.ID) != 1 {
		t.Fatal("no audit row for the new user")
	}
	// The database refuses a role outside the two.
	bad := store.User{Email: fmt.Sprintf("role%d@example.org", time.Now().UnixNano()), Name: "C", PasswordHash: "h", Role: "owner"}
	if err := st.CreateUser(ctx, store.System, &bad); err == nil {
		t.Fatal("role owner accepted")
	}
}

func TestCreateFirstUserOnlyOnce(t *testing.T) {
	ctx := context.Background()
	pool, _ := testdb.Empty(t)
	if _, err := store.Migrate(ctx, pool); err != nil {
		t.Fatal(err)
	}
	st := store.New(pool)
	var wg sync.WaitGroup
	errs := make([]error, 4)
	for i := range errs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			u := store.User{Email: fmt.Sprintf("first%d@example.org", i), Name: "First", PasswordHash: "h", Role: store.RoleAdmin}
			errs[i] = st.CreateFirstUser(ctx, &u)
		}()
	}
	wg.Wait()
	ok := 0
	for _, err := range errs {
		switch {
		case err == nil:
			ok++
		case !errors.Is(err, store.ErrUsersExist):
			t.Fatalf("unexpected error %v", err)
		}
	}
	if n, _ := st.CountUsers(ctx); ok != 1 || n != 1 {
		t.Fatalf("%d setups succeeded, %d users exist; want 1 and 1", ok, n)
	}
}

func TestFailedWriteLeavesNoAuditRow(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	missing := store.Client{ID: 987654321, Name: "Nobody", Sex: store.SexMale}
	if err := st.UpdateClient(ctx, store.System, &missing); !errors.Is(err, store.ErrNotFound) {
		t.Fatalf("update of a missing client: %v", err)
	}
	if auditCount(t, st, "client", missing.ID) != 0 {
		t.Fatal("an audit row claims a change that did not happen")
	}
	c := store.Client{Name: uniq("Audit"), Sex: store.SexMale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	// A value the CHECK constraint refuses rolls back the audit row with it.
	before := auditCount(t, st, "body_mass", 0)
	m := store.BodyMass{ClientID: c.ID, MeasuredOn: time.Now(), MassKg: 5, EnteredUnit: "kg"}
	if err := st.AddBodyMass(ctx, store.System, &m); err == nil {
		t.Fatal("5 kg accepted by the database")
	}
	var rows int
	if err := st.Pool.QueryRow(ctx, `SELECT count(*) FROM audit_log WHERE entity = 'body_mass' AND (detail->>'client_id')::bigint = $1`, c.ID).Scan(&rows); err != nil {
		t.Fatal(err)
	}
	if rows != 0 || auditCount(t, st, "body_mass", 0) != before {
		t.Fatalf("audit rows for the refused measurement: %d", rows)
	}
}

func TestDatabaseRefusesOutOfRangeValues(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	c := store.Client{Name: uniq("Limits"), Sex: store.SexFemale}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	day := time.Date(2027, 1, 10, 0, 0, 0, 0, time.UTC)
	f := func(x float64) *float64 { return &x }
	for name, tr := range map[string]store.TrainingSession{
		"rpe 11":        {ClientID: c.ID, OnDate: day, Modality: "run", DurationMin: 30, IntensityKind: "rpe", IntensityValue: f(11), Status: "done"},
		"zero duration": {ClientID: c.ID, OnDate: day, Modality: "run", DurationMin: 0, IntensityKind: "rpe", IntensityValue: f(5), Status: "done"},
		"25 h":          {ClientID: c.ID, OnDate: day, Modality: "run", DurationMin: 1500, IntensityKind: "rpe", IntensityValue: f(5), Status: "done"},
		"vo2 130":       {ClientID: c.ID, OnDate: day, Modality: "row", DurationMin: 30, IntensityKind: "pct_vo2max", IntensityValue: f(130), Status: "done"},
		"zone unknown":  {ClientID: c.ID, OnDate: day, Modality: "row", DurationMin: 30, IntensityKind: "zone", IntensityZone: "red", Status: "done"},
	} {
		if err := st.AddTraining(ctx, store.System, &tr); err == nil {
			t.Errorf("%s accepted", name)
		}
	}
	if err := st.AddEvent(ctx, store.System, &store.Event{ClientID: c.ID, Name: "x", StartsAt: day, TimeZone: "UTC", Modality: "run",
		ExpectedDurationMin: 60, Priority: "D"}); err == nil {
		t.Error("priority D accepted")
	}
	h := 99.0
	c.HeightCm = &h
	if err := st.UpdateClient(ctx, store.System, &c); err == nil {
		t.Error("height 99 cm accepted")
	}
}

func TestListsAndOrder(t *testing.T) {
	ctx := context.Background()
	st := store.New(testdb.Pool(t))
	tag := uniq("Order")
	c := store.Client{Name: tag + " 100% Sprint_er", Sex: store.SexMale, Sport: "Track"}
	if err := st.CreateClient(ctx, store.System, &c); err != nil {
		t.Fatal(err)
	}
	// Pattern characters in the search are taken literally.
	if rows, _ := st.ListClients(ctx, store.ClientFilter{Query: "100% Sprint_er"}); len(rows) != 1 {
		t.Fatalf("literal search found %d", len(rows))
	}
	if rows, _ := st.ListClients(ctx, store.ClientFilter{Query: "100%_Sprint"}); len(rows) != 0 {
		t.Fatalf("%% and _ acted as wildcards: %d rows", len(rows))
	}
	// Words match in any order, and accents fold both ways.
	atag := uniq("Accent")
	accented := store.Client{Name: atag + " Tomás Ångström", Sex: store.SexMale, Sport: "Road cycling"}
	if err := st.CreateClient(ctx, store.System, &accented); err != nil {
		t.Fatal(err)
	}
	for _, q := range []string{"tomas " + atag, "ANGSTROM tomás " + atag, atag + " cycling tomas", atag + "  road   Tomás"} {
		if rows, _ := st.ListClients(ctx, store.ClientFilter{Query: q}); len(rows) != 1 || rows[0].ID != accented.ID {
			t.Errorf("search %q found %d clients, want only %q", q, len(rows), accented.Name)
		}
	}
	if rows, _ := st.ListClients(ctx, store.ClientFilter{Query: atag + " tomas running"}); len(rows) != 0 {
		t.Errorf("a word matching neither name nor sport still found %d clients", len(rows))
	}
	d := func(s string) time.Time { t, _ := time.Parse("2006-01-02", s); return t }
	for _, m := range []store.BodyMass{{MeasuredOn: d("2027-01-05"), MassKg: 80}, {MeasuredOn: d("2027-01-20"), MassKg: 79.5}, {MeasuredOn: d("2027-01-12"), MassKg: 79.8, BodyFatPct: func() *float64 { x := 14.0; return &x }()}} {
		m.ClientID, m.EnteredUnit = c.ID, "kg"
		if err := st.AddBodyMass(ctx, store.System, &m); err != nil {
			t.Fatal(err)
		}
	}
	latest, err := st.LatestBodyMass(ctx, c.ID)
	if err != nil || latest.MassKg != 79.5 {
		t.Fatalf("latest %+v %v", latest, err)
	}
	fat, err := st.LatestBodyFat(ctx, c.ID)
	if err != nil || *fat.BodyFatPct != 14 {
		t.Fatalf("latest body fat %+v %v", fat, err)
	}
	rows, _ := st.ListClients(ctx, store.ClientFilter{Query: tag})
	if len(rows) != 1 || rows[0].LatestMassKg == nil || *rows[0].LatestMassKg != 79.5 {
		t.Fatalf("list row %+v", rows)
	}
	five := 5.0
	for _, s := range []store.TrainingSession{
		{OnDate: d("2027-01-11"), StartTime: "16:30", Modality: "row"},
		{OnDate: d("2027-01-11"), StartTime: "06:00", Modality: "row"},
		{OnDate: d("2027-01-10"), Modality: "run"},
		{OnDate: d("2027-01-15"), Modality: "run"},
	} {
		s.ClientID, s.DurationMin, s.IntensityKind, s.IntensityValue, s.Status = c.ID, 60, "rpe", &five, "done"
		if err := st.AddTraining(ctx, store.System, &s); err != nil {
			t.Fatal(err)
		}
	}
	between, err := st.TrainingBetween(ctx, c.ID, d("2027-01-10"), d("2027-01-11"))
	if err != nil || len(between) != 3 || between[0].OnDate != d("2027-01-10") || between[1].StartTime != "06:00" || between[2].StartTime != "16:30" {
		t.Fatalf("between: %+v %v", between, err)
	}
	if between[1].FuelIntensity() != "rpe:5" {
		t.Fatalf("fuel intensity %q", between[1].FuelIntensity())
	}
}
