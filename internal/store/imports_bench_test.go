package store_test

import (
	"bytes"
	"context"
	"fmt"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"

	"larder/internal/importer"
	"larder/internal/store"
	"larder/internal/testdb"
)

// The import's speed goal: 100,000 body-mass rows in under 3 s, and at least
// half the speed of a bare COPY of the same rows into body_mass. Each
// iteration writes to a new client, so every row is new, as in a first
// import of a practice's history.
//
//	go test -run '^$' -bench Import100k -benchtime 3x ./internal/store

const benchRows = 100_000

func benchCSV() []byte {
	var b bytes.Buffer
	b.WriteString("date;body mass;body fat %;method\n")
	start := time.Date(1900, 1, 1, 0, 0, 0, 0, time.UTC) // one a day: 274 years of dates, all different
	for i := 0; i < benchRows; i++ {
		fmt.Fprintf(&b, "%s;%d,%d;%d,%d;scale\n", start.AddDate(0, 0, i).Format("02/01/2006"), 55+i%40, i%10, 8+i%20, i%10)
	}
	return b.Bytes()
}

func benchRowsFor(b *testing.B, sh *importer.Sheet, clientID int64) []store.ImportMass {
	rows := make([]store.ImportMass, len(sh.Mass))
	for i, m := range sh.Mass {
		rows[i] = m.ForStore(clientID)
	}
	return rows
}

// BenchmarkImport100kCSV: the whole import of a 100,000-line file — read
// and check the CSV, stage it with COPY, move it with one INSERT … SELECT
// that leaves out duplicates, audit.
func BenchmarkImport100kCSV(b *testing.B) {
	st := store.New(testdb.Pool(b))
	data := benchCSV()
	b.SetBytes(int64(len(data)))
	for i := 0; b.Loop(); i++ {
		b.StopTimer()
		c := importClient(b, st, uniq("Bench csv"))
		b.StartTimer()
		sh, err := importer.ReadCSV(data, importer.Options{Kind: importer.KindBodyMass, DateOrder: importer.OrderDMY})
		if err != nil || len(sh.Mass) != benchRows {
			b.Fatalf("read: %v, %d rows, problems %v", err, len(sh.Mass), len(sh.Problems))
		}
		res, err := st.ImportBodyMass(context.Background(), store.System, "bench.csv", benchRowsFor(b, sh, c.ID))
		if err != nil || res.Added != benchRows {
			b.Fatalf("import: %v %d", err, res.Added)
		}
	}
}

// BenchmarkImport100kStore: the database part alone (staging COPY, INSERT
// … SELECT with the duplicate checks, audit), on rows already read.
func BenchmarkImport100kStore(b *testing.B) {
	st := store.New(testdb.Pool(b))
	sh, err := importer.ReadCSV(benchCSV(), importer.Options{Kind: importer.KindBodyMass, DateOrder: importer.OrderDMY})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		b.StopTimer()
		c := importClient(b, st, uniq("Bench store"))
		rows := benchRowsFor(b, sh, c.ID)
		b.StartTimer()
		res, err := st.ImportBodyMass(context.Background(), store.System, "bench.csv", rows)
		if err != nil || res.Added != benchRows {
			b.Fatalf("import: %v %d", err, res.Added)
		}
	}
}

// BenchmarkImport100kRawCopy: the yardstick — the same rows copied straight
// into body_mass in one transaction, with no staging, no duplicate check
// and no audit.
func BenchmarkImport100kRawCopy(b *testing.B) {
	st := store.New(testdb.Pool(b))
	sh, err := importer.ReadCSV(benchCSV(), importer.Options{Kind: importer.KindBodyMass, DateOrder: importer.OrderDMY})
	if err != nil {
		b.Fatal(err)
	}
	ctx := context.Background()
	for b.Loop() {
		b.StopTimer()
		c := importClient(b, st, uniq("Bench raw"))
		rows := benchRowsFor(b, sh, c.ID)
		b.StartTimer()
		err := st.InTx(ctx, func(tx pgx.Tx) error {
			n, err := tx.CopyFrom(ctx, pgx.Identifier{"body_mass"}, []string{"client_id", "measured_on", "mass_kg", "body_fat_pct", "method", "entered_unit"},
				pgx.CopyFromSlice(len(rows), func(i int) ([]any, error) {
					r := &rows[i]
					return []any{r.ClientID, r.On, r.MassKg, r.BodyFatPct, r.Method, r.Unit}, nil
				}))
			if err == nil && n != benchRows {
				err = fmt.Errorf("copied %d rows", n)
			}
			return err
		})
		if err != nil {
			b.Fatal(err)
		}
	}
}
