package fuel

import (
	"fmt"
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
)

// Every source label the engine prints must be traceable: a "cite as"
// entry of REFERENCES.md, or a row of docs/references-practice.md. That
// file holds a row for every value the guideline table labels "common
// practice" or "model assumption" (what, value, why, status), and the
// sources cited from memory that REFERENCES.md does not hold yet.
// REFERENCES.md lives outside the repository (/work/shared); its cite-as
// entries are kept in testdata/fuel/references-cite-as.txt so the test
// runs on a clean clone, and the snapshot is checked against the file
// when it is found beside the repository.

const (
	citeAsSnapshot = "../../testdata/fuel/references-cite-as.txt"
	practiceDoc    = "../../docs/references-practice.md"
)

// citeAsEntries returns the "cite as" cells of a markdown file's tables,
// emphasis removed and "same" resolved to the row above, each once.
func citeAsEntries(md string) []string {
	var out []string
	col, prev := -1, ""
	for _, line := range strings.Split(md, "\n") {
		line = strings.TrimSpace(line)
		if !strings.HasPrefix(line, "|") {
			col, prev = -1, ""
			continue
		}
		cells := strings.Split(strings.Trim(line, "|"), "|")
		for i := range cells {
			cells[i] = strings.Join(strings.Fields(strings.ReplaceAll(cells[i], "*", "")), " ")
		}
		if col < 0 {
			for i, c := range cells {
				if strings.EqualFold(c, "cite as") {
					col = i
				}
			}
			continue
		}
		if strings.HasPrefix(cells[0], "---") || col >= len(cells) {
			continue
		}
		c := cells[col]
		if c == "same" {
			c = prev
		}
		prev = c
		if c != "" && !slices.Contains(out, c) {
			out = append(out, c)
		}
	}
	return out
}

func readSnapshot(t *testing.T) []string {
	t.Helper()
	b, err := os.ReadFile(citeAsSnapshot)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, l := range strings.Split(string(b), "\n") {
		if l = strings.TrimSpace(l); l != "" && !strings.HasPrefix(l, "#") {
			out = append(out, l)
		}
	}
	return out
}

// practiceRow is one row of docs/references-practice.md's value table.
type practiceRow struct{ key, value, why, status string }

// readPracticeDoc returns the value rows by key and the cite-as entries
// of the sources-from-memory table.
func readPracticeDoc(t *testing.T) (map[string]practiceRow, []string) {
	t.Helper()
	b, err := os.ReadFile(practiceDoc)
	if err != nil {
		t.Fatal(err)
	}
	rows := map[string]practiceRow{}
	for _, line := range strings.Split(string(b), "\n") {
		if !strings.HasPrefix(line, "| `") {
			continue
		}
		cells := strings.Split(strings.Trim(line, "|"), "|")
		if len(cells) != 5 {
			t.Errorf("%s: row %q has %d cells, want 5 (key, what, value, why, status)", practiceDoc, line, len(cells))
			continue
		}
		key := strings.Trim(strings.TrimSpace(cells[0]), "`")
		if _, dup := rows[key]; dup {
			t.Errorf("%s: key %s twice", practiceDoc, key)
		}
		rows[key] = practiceRow{key, strings.TrimSpace(cells[2]), strings.TrimSpace(cells[3]), strings.TrimSpace(cells[4])}
	}
	return rows, citeAsEntries(string(b))
}

// docValue is how the document writes a row's value: Min, or "Min / Max".
func docValue(g Guideline) string {
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
	if g.Min == g.Max {
		return f(g.Min)
	}
	return f(g.Min) + " / " + f(g.Max)
}

// traced reports whether a label is a cite-as entry, or the leading part
// of one before a "; " (REFERENCES.md adds notes such as "; range is
// common practice" after some citations).
func traced(label string, entries []string) bool {
	for _, e := range entries {
		if e == label || strings.HasPrefix(e, label+"; ") {
			return true
		}
	}
	return false
}

// sourceLabels are the traced labels (the snapshot's cite-as entries and
// the practice document's own sources), read once for the plan checks.
var sourceLabels = sync.OnceValue(func() []string {
	var out []string
	for _, name := range []string{citeAsSnapshot, practiceDoc} {
		b, err := os.ReadFile(name)
		if err != nil {
			panic(err)
		}
		if name == citeAsSnapshot {
			for _, l := range strings.Split(string(b), "\n") {
				if l = strings.TrimSpace(l); l != "" && !strings.HasPrefix(l, "#") {
					out = append(out, l)
				}
			}
			continue
		}
		out = append(out, citeAsEntries(string(b))...)
	}
	return out
})

// isTracedSource reports whether a finding's or a row's source label is
// traced to REFERENCES.md or to docs/references-practice.md.
func isTracedSource(label string) bool { return traced(label, sourceLabels()) }

// sourceConstants returns the string constants named Src… declared in the
// package's non-test files: every source label a finding or a table row
// can carry.
func sourceConstants(t *testing.T) map[string]string {
	t.Helper()
	fset := token.NewFileSet()
	files, err := filepath.Glob("*.go")
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]string{}
	for _, name := range files {
		if strings.HasSuffix(name, "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, name, nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			vs, ok := n.(*ast.ValueSpec)
			if !ok {
				return true
			}
			for i, id := range vs.Names {
				if !strings.HasPrefix(id.Name, "Src") || i >= len(vs.Values) {
					continue
				}
				if lit, ok := vs.Values[i].(*ast.BasicLit); ok && lit.Kind == token.STRING {
					if v, err := strconv.Unquote(lit.Value); err == nil {
						out[id.Name] = v
					}
				}
			}
			return true
		})
	}
	return out
}

func TestEverySourceIsTraced(t *testing.T) {
	refs := readSnapshot(t)
	rows, extra := readPracticeDoc(t)
	allowed := append(append([]string{}, refs...), extra...)

	consts := sourceConstants(t)
	if len(consts) < 20 {
		t.Fatalf("found only %d Src constants; the parser missed them", len(consts))
	}
	for name, label := range consts {
		if !traced(label, allowed) {
			t.Errorf("%s = %q is neither a REFERENCES.md cite-as entry nor a source of %s", name, label, practiceDoc)
		}
	}
	for _, g := range Guidelines {
		if !traced(g.Source, allowed) {
			t.Errorf("%s: source %q is neither a REFERENCES.md cite-as entry nor a source of %s", g.Key, g.Source, practiceDoc)
		}
		if g.Source != SrcCommon && g.Source != SrcModel {
			continue
		}
		r, ok := rows[g.Key]
		switch {
		case !ok:
			t.Errorf("%s (%s) has no row in %s", g.Key, g.Source, practiceDoc)
		case !strings.HasPrefix(r.value, docValue(g)+" "):
			t.Errorf("%s: %s gives %q, the table %s %s", g.Key, practiceDoc, r.value, docValue(g), g.Unit)
		case r.why == "" || r.status == "":
			t.Errorf("%s: %s gives no why or status", g.Key, practiceDoc)
		case !strings.HasPrefix(r.status, g.Source):
			t.Errorf("%s: status %q does not say %q", g.Key, r.status, g.Source)
		}
	}
	for key := range rows {
		i := slices.IndexFunc(Guidelines, func(g Guideline) bool { return g.Key == key })
		if i < 0 || (Guidelines[i].Source != SrcCommon && Guidelines[i].Source != SrcModel) {
			t.Errorf("%s names %s, which is not a common-practice or model-assumption value of the table", practiceDoc, key)
		}
	}
}

// sharedReferences finds REFERENCES.md in a "shared" folder beside the
// repository or beside a folder above it (worktrees sit one level deeper).
func sharedReferences() (string, bool) {
	dir, err := filepath.Abs("../..")
	if err != nil {
		return "", false
	}
	for range 3 {
		dir = filepath.Dir(dir)
		p := filepath.Join(dir, "shared", "REFERENCES.md")
		if _, err := os.Stat(p); err == nil {
			return p, true
		}
	}
	return "", false
}

func TestReferencesSnapshotIsCurrent(t *testing.T) {
	path, ok := sharedReferences()
	if !ok {
		t.Skip("shared/REFERENCES.md is not beside the repository (a clean clone); the committed snapshot stands")
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	live, snap := citeAsEntries(string(b)), readSnapshot(t)
	if len(live) < 20 {
		t.Fatalf("%s: only %d cite-as entries parsed", path, len(live))
	}
	for _, e := range live {
		if !slices.Contains(snap, e) {
			t.Errorf("%s cites %q, missing from %s: refresh the snapshot", path, e, citeAsSnapshot)
		}
	}
	for _, e := range snap {
		if !slices.Contains(live, e) {
			t.Errorf("%s holds %q, which %s no longer cites", citeAsSnapshot, e, path)
		}
	}
	t.Log(fmt.Sprintf("%d cite-as entries, snapshot current", len(live)))
}
