// Package sheettest reads back the PDFs the plan sheet writes, for tests:
// how many pages they have and what text a reader would extract.
package sheettest

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

var pageObj = regexp.MustCompile(`/Type /Page\b[^s]`)

// Pages counts the page objects of a PDF written by fpdf.
func Pages(pdf []byte) int { return len(pageObj.FindAll(pdf, -1)) }

// Text extracts a PDF's text with pdftotext (poppler-utils), whitespace
// folded to single spaces; ok is false when pdftotext is not installed,
// and the test fails instead when LARDER_TEST_REQUIRE_BROWSER=1 (CI).
func Text(t testing.TB, pdf []byte) (string, bool) {
	t.Helper()
	bin, err := exec.LookPath("pdftotext")
	if err != nil {
		if os.Getenv("LARDER_TEST_REQUIRE_BROWSER") == "1" {
			t.Fatal("pdftotext (poppler-utils) is required: ", err)
		}
		return "", false
	}
	path := filepath.Join(t.TempDir(), "sheet.pdf")
	if err := os.WriteFile(path, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	// -raw keeps the order the sheet draws in: row by row, cell by cell.
	out, err := exec.Command(bin, "-raw", "-enc", "UTF-8", path, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	return strings.Join(strings.Fields(string(out)), " "), true
}
