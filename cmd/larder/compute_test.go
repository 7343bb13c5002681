package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

func computeExample(t *testing.T, name string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errs bytes.Buffer
	code = runCompute([]string{"--in", filepath.Join("..", "..", "testdata", "fuel", name)}, strings.NewReader(""), &out, &errs)
	return code, out.String(), errs.String()
}

func TestComputeExamplesGiveTheAnswerKeys(t *testing.T) {
	// A computed plan's JSON has at least these keys; units are in the names.
	top := []string{"days", "pre_event_meal", "during_event", "repletion", "glycogen", "expected_mass_gain_kg", "findings", "caution"}
	day := []string{"date", "cho_g_per_kg", "cho_g", "protein_g", "fat_g", "energy_kcal", "feeds"}
	feed := []string{"at", "cho_g", "protein_g"}
	for _, name := range []string{"marathon-loading.json", "cyclist-5h-race.json", "rower-two-sessions.json", "runner-10k-race.json", "training-week.json"} {
		code, out, errs := computeExample(t, name)
		if code != 0 {
			t.Fatalf("%s: exit %d, stderr %s", name, code, errs)
		}
		var plan map[string]any
		if err := json.Unmarshal([]byte(out), &plan); err != nil {
			t.Fatalf("%s: output is not JSON: %v", name, err)
		}
		for _, k := range top {
			if _, ok := plan[k]; !ok {
				t.Errorf("%s: no key %q", name, k)
			}
		}
		days, _ := plan["days"].([]any)
		if len(days) == 0 {
			t.Fatalf("%s: no days", name)
		}
		d0 := days[0].(map[string]any)
		for _, k := range day {
			if _, ok := d0[k]; !ok {
				t.Errorf("%s: day has no key %q", name, k)
			}
		}
		feeds := d0["feeds"].([]any)
		f0 := feeds[0].(map[string]any)
		for _, k := range feed {
			if _, ok := f0[k]; !ok {
				t.Errorf("%s: feed has no key %q", name, k)
			}
		}
		findings := plan["findings"].([]any)
		if len(findings) == 0 {
			t.Errorf("%s: no findings", name)
		}
		for _, k := range []string{"code", "level", "message", "source"} {
			if _, ok := findings[0].(map[string]any)[k]; !ok {
				t.Errorf("%s: finding has no key %q", name, k)
			}
		}
	}
	// Specific to the kinds: a loading plan has the glycogen and in-event keys of the issue;
	// a race plan has no repletion (null, not a silent zero).
	_, out, _ := computeExample(t, "marathon-loading.json")
	var plan struct {
		PreEventMeal map[string]any `json:"pre_event_meal"`
		DuringEvent  map[string]any `json:"during_event"`
		Glycogen     map[string]any `json:"glycogen"`
		Repletion    any            `json:"repletion"`
		Days         []struct {
			Feeds []struct {
				At string `json:"at"`
			} `json:"feeds"`
		} `json:"days"`
	}
	if err := json.Unmarshal([]byte(out), &plan); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"at", "cho_g_per_kg", "cho_g"} {
		if _, ok := plan.PreEventMeal[k]; !ok {
			t.Errorf("pre_event_meal has no %q", k)
		}
	}
	for _, k := range []string{"cho_g_per_h", "total_cho_g"} {
		if _, ok := plan.DuringEvent[k]; !ok {
			t.Errorf("during_event has no %q", k)
		}
	}
	for _, k := range []string{"muscle_g_start", "liver_g_start", "runs_out_at_km", "runs_out_at_min"} {
		if _, ok := plan.Glycogen[k]; !ok {
			t.Errorf("glycogen has no %q", k)
		}
	}
	if plan.Repletion != nil {
		t.Errorf("loading plan repletion = %v, want null", plan.Repletion)
	}
	// Times are RFC 3339 with the event's offset.
	if at := plan.Days[0].Feeds[0].At; !strings.HasSuffix(at, "+02:00") {
		t.Errorf("feed time %q not in the event's offset", at)
	}
	_, out, _ = computeExample(t, "rower-two-sessions.json")
	if !strings.Contains(out, `"cho_g_per_kg_per_h": 1.1`) || !strings.Contains(out, `"pre_event_meal": null`) {
		t.Errorf("repletion output lacks its rate or a null pre-event meal")
	}
}

func TestComputeBadInputNamesFields(t *testing.T) {
	cases := []struct {
		name, in string
		fields   []string
	}{
		{"missing fields", `{"kind":"loading","athlete":{"sex":"x","body_mass_kg":-3}}`,
			[]string{"athlete.sex", "athlete.body_mass_kg", "event"}},
		{"unknown field", `{"kind":"race","athlete":{"sex":"male","body_mass_kg":70},"speed":3}`, []string{"speed"}},
		{"bad time", `{"kind":"race","athlete":{"sex":"male","body_mass_kg":70},"event":{"starts_at":"tomorrow","modality":"run","expected_duration_min":40}}`,
			[]string{"event.starts_at"}},
		{"bad intensity and order", `{"kind":"repletion","athlete":{"sex":"female","body_mass_kg":60},` +
			`"training":[{"date":"2027-01-01","duration_min":30,"intensity":"fast"}],` +
			`"session_end":"2027-01-01T12:00:00Z","next_start":"2027-01-01T10:00:00Z"}`,
			[]string{"training[0].intensity", "next_start"}},
		{"wrong type", `{"kind":"race","athlete":{"sex":"male","body_mass_kg":"seventy"}}`, []string{"athlete.body_mass_kg"}},
		{"not JSON", `{"kind":`, []string{"request"}},
	}
	for _, c := range cases {
		var out, errs bytes.Buffer
		code := runCompute(nil, strings.NewReader(c.in), &out, &errs)
		if code != 2 {
			t.Errorf("%s: exit %d, want 2 (stderr %s)", c.name, code, errs.String())
			continue
		}
		if out.Len() != 0 {
			t.Errorf("%s: wrote a plan for bad input", c.name)
		}
		for _, f := range c.fields {
			if !strings.Contains(errs.String(), "  "+f+": ") {
				t.Errorf("%s: stderr does not name %q:\n%s", c.name, f, errs.String())
			}
		}
	}
	// A missing file is another error (exit 1); an unknown flag is a usage error (2).
	var out, errs bytes.Buffer
	if code := runCompute([]string{"--in", filepath.Join(t.TempDir(), "none.json")}, nil, &out, &errs); code != 1 {
		t.Errorf("missing file: exit %d, want 1", code)
	}
	if code := runCompute([]string{"--bogus"}, nil, &out, &errs); code != 2 {
		t.Errorf("unknown flag: exit %d, want 2", code)
	}
}

func TestComputeReadsStdinThroughDispatch(t *testing.T) {
	in, err := os.ReadFile(filepath.Join("..", "..", "testdata", "fuel", "runner-10k-race.json"))
	if err != nil {
		t.Fatal(err)
	}
	var out, errs bytes.Buffer
	if code := run(context.Background(), []string{"compute"}, bytes.NewReader(in), &out, &errs); code != 0 {
		t.Fatalf("exit %d: %s", code, errs.String())
	}
	if !strings.Contains(out.String(), `"kind": "race"`) {
		t.Errorf("no race plan on stdout")
	}
}

// TestComputeBinary builds the real binary and runs it as a user would.
func TestComputeBinary(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the binary")
	}
	goTool, err := exec.LookPath("go")
	if err != nil {
		t.Skip("no go tool")
	}
	bin := filepath.Join(t.TempDir(), "larder")
	if out, err := exec.Command(goTool, "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("build: %v\n%s", err, out)
	}
	cmd := exec.Command(bin, "compute")
	cmd.Stdin = strings.NewReader(`{"kind":"week","athlete":{"sex":"female","body_mass_kg":0}}`)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	err = cmd.Run()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != 2 {
		t.Fatalf("bad input: %v, want exit 2", err)
	}
	if !strings.Contains(stderr.String(), "athlete.body_mass_kg: is required") || !strings.Contains(stderr.String(), "start_date") {
		t.Errorf("stderr: %s", stderr.String())
	}
	out, err := exec.Command(bin, "compute", "--in", filepath.Join("..", "..", "testdata", "fuel", "marathon-loading.json")).Output()
	if err != nil {
		t.Fatalf("valid input: %v", err)
	}
	if !json.Valid(out) || !bytes.Contains(out, []byte(`"expected_mass_gain_kg"`)) {
		t.Errorf("output is not the plan JSON")
	}
}
