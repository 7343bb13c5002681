package fuel

import (
	"os"
	"path/filepath"
	"testing"
)

func benchFile(b *testing.B, name string) Request {
	b.Helper()
	f, err := os.Open(filepath.Join("..", "..", "testdata", "fuel", name))
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	req, err := DecodeRequest(f)
	if err != nil {
		b.Fatal(err)
	}
	return req
}

// BenchmarkStageRaceFourStages: the goal is under 3 ms a plan.
func BenchmarkStageRaceFourStages(b *testing.B) {
	req := benchFile(b, "stage-race-4-day.json")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Compute(req); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRace48Hours: the goal is under 2 ms a plan.
func BenchmarkRace48Hours(b *testing.B) {
	req := benchFile(b, "ultra-48h-race.json")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Compute(req); err != nil {
			b.Fatal(err)
		}
	}
}
