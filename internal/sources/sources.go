// Package sources presents the guideline table's sources to people: a short
// citation for staff pages and the dietitian's sheet, and, for the Sources
// page, every value of the table with its full source and its status
// (verified, from memory, common practice, model assumption). The status
// words live on the Sources page only; sheets and the phone page never
// print them. The table itself is internal/fuel's; this package reads it.
package sources

import (
	"regexp"
	"strconv"
	"strings"

	"larder/internal/fuel"
)

// Status says how far a value's source has been checked.
type Status string

// The statuses, from the most to the least checked.
const (
	// Verified: cited as the reference list cites it, from the publication.
	Verified Status = "verified"
	// CommonPractice: a convention of sports-dietetics practice, no single
	// publication.
	CommonPractice Status = "common practice"
	// ModelAssumption: a modelling choice of this engine that no reference
	// fixes.
	ModelAssumption Status = "model assumption"
	// FromMemory: cited from memory, not yet checked against the
	// publication.
	FromMemory Status = "from memory"
)

// Statuses in the order the Sources page explains them.
var Statuses = []Status{Verified, FromMemory, CommonPractice, ModelAssumption}

// StatusOf reads a source's status from how the guideline table writes it;
// a source of several parts takes its least checked part's status.
func StatusOf(src string) Status {
	s := strings.ToLower(src)
	switch {
	case strings.Contains(s, "from memory"):
		return FromMemory
	case strings.Contains(s, fuel.SrcModel):
		return ModelAssumption
	case strings.Contains(s, fuel.SrcCommon):
		return CommonPractice
	}
	return Verified
}

// statusNote matches the status remarks a source carries in brackets.
var statusNote = regexp.MustCompile(`\s*\((?:from memory|review)[^)]*\)`)

// author matches the start of a journal citation: a surname (with its
// particle), initials (optional), a second author or "et al." (optional),
// and later, outside brackets, the year.
var author = regexp.MustCompile(`^((?:van der |van |von |de la |de )?\p{Lu}[\p{L}'’-]*\p{Ll}[\p{L}'’-]*)(?:\s+\p{Lu}{1,3}\.?)?` +
	`(?:,\s+(\p{Lu}[\p{L}'’-]*\p{Ll}[\p{L}'’-]*)\s+\p{Lu}{1,3}\.?)?(\s+et al\.)?[\s.,][^(]*?\b((?:19|20)\d{2})\b`)

var year = regexp.MustCompile(`\b(?:19|20)\d{2}\b`)

// Short is the citation staff pages and the dietitian's sheet print:
// author and year for a journal paper ("Bussau et al. 2002"), a statement
// or standard by its short name, without status remarks. Common practice
// and model assumptions are named plainly; their status is on the
// Sources page.
func Short(src string) string {
	src = statusNote.ReplaceAllString(src, "")
	var parts []string
	for _, p := range splitTop(src) {
		p = strings.TrimSpace(p)
		switch {
		case p == "":
			continue
		case strings.EqualFold(p, fuel.SrcCommon):
			p = "sports-dietetics practice"
		case strings.EqualFold(p, fuel.SrcModel):
			p = "Larder's model"
		default:
			if m := author.FindStringSubmatch(p); m != nil {
				p = m[1]
				if m[2] != "" {
					p += " & " + m[2]
				}
				p += m[3] + " " + m[4]
			} else {
				if i := strings.Index(p, " ("); i > 0 {
					p = p[:i] // "IOC consensus statement on REDs (Mountjoy …)"
				}
				if loc := year.FindStringIndex(p); loc != nil {
					p = p[:loc[1]] // "ACSM/AND/DC 2016 joint position statement"
				}
			}
		}
		if !contains(parts, p) {
			parts = append(parts, p)
		}
	}
	return strings.Join(parts, "; ")
}

// splitTop splits a source at "; " outside brackets.
func splitTop(s string) []string {
	var out []string
	depth, start := 0, 0
	for i := 0; i < len(s); i++ {
		switch s[i] {
		case '(':
			depth++
		case ')':
			depth--
		case ';':
			if depth == 0 && i+1 < len(s) && s[i+1] == ' ' {
				out = append(out, s[start:i])
				start = i + 1
			}
		}
	}
	return append(out, s[start:])
}

func contains(xs []string, x string) bool {
	for _, y := range xs {
		if y == x {
			return true
		}
	}
	return false
}

// Row is one value of the guideline table as the Sources page lists it.
type Row struct {
	Key, Description string
	Value, Unit      string
	Source, Short    string
	Status           Status
}

// Rows lists every value of the guideline table, in its order. A value
// from a verified source whose description says the figures themselves
// were taken from memory (activity values read from a compendium) is
// listed as from memory.
func Rows() []Row {
	out := make([]Row, 0, len(fuel.Guidelines))
	for _, g := range fuel.Guidelines {
		st := StatusOf(g.Source)
		if st == Verified && strings.Contains(strings.ToLower(g.Description), "from memory") {
			st = FromMemory
		}
		out = append(out, Row{Key: g.Key, Description: g.Description, Value: value(g), Unit: g.Unit,
			Source: g.Source, Short: Short(g.Source), Status: st})
	}
	return out
}

// Count is how many values of a status the table has.
func Count(rows []Row, st Status) int {
	n := 0
	for _, r := range rows {
		if r.Status == st {
			n++
		}
	}
	return n
}

func value(g fuel.Guideline) string {
	if g.Min == g.Max {
		return num(g.Min)
	}
	return num(g.Min) + "–" + num(g.Max)
}

func num(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }
