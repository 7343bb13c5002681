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

// benchCompute computes req b.N times. Beside the wall time per plan
// (ns/op) it reports the processor time per plan (cpu-ns/op): on a
// machine shared with other work the wall time counts the waits for a
// core, the processor time only the plan's own work.
func benchCompute(b *testing.B, req Request) {
	b.ReportAllocs()
	start := cpuTime()
	for b.Loop() {
		if _, err := Compute(req); err != nil {
			b.Fatal(err)
		}
	}
	if used := cpuTime() - start; used > 0 {
		b.ReportMetric(float64(used.Nanoseconds())/float64(b.N), "cpu-ns/op")
	}
}

// BenchmarkStageRaceFourStages: the goal is under 3 ms a plan.
func BenchmarkStageRaceFourStages(b *testing.B) {
	benchCompute(b, benchFile(b, "stage-race-4-day.json"))
}

// BenchmarkRace48Hours: the goal is under 2 ms a plan.
func BenchmarkRace48Hours(b *testing.B) {
	benchCompute(b, benchFile(b, "ultra-48h-race.json"))
}
