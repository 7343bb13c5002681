package sources

import (
	"strings"
	"testing"

	"larder/internal/fuel"
)

// Short citations of the sources as the reference list cites them
// (REFERENCES.md "cite as"), written out by hand from each publication's
// first author(s) and year.
func TestShort(t *testing.T) {
	cases := map[string]string{
		fuel.SrcBussau:     "Bussau et al. 2002",
		fuel.SrcVanLoon:    "van Loon et al. 2000",
		fuel.SrcIvy:        "Ivy et al. 1988",
		fuel.SrcIvy2004:    "Ivy 2004",
		fuel.SrcSedlock:    "Sedlock 2008",
		fuel.SrcOlsson:     "Olsson & Saltin 1970",
		fuel.SrcJentjens:   "Jentjens & Jeukendrup 2003",
		fuel.SrcDensity:    "Bergström et al. 1967; Sherman et al. 1981",
		fuel.SrcACSMJeuk:   "ACSM/AND/DC 2016; Jeukendrup 2014",
		fuel.SrcIOC:        "IOC consensus statement on REDs",
		fuel.SrcAtwater:    "Atwater general factors",
		fuel.SrcAinsworth:  "Ainsworth et al. 2011",
		fuel.SrcRomijn:     "Romijn et al. 1993",
		fuel.SrcBoer:       "Boer 1984",
		fuel.SrcCommon:     "sports-dietetics practice",
		fuel.SrcModel:      "Larder's model",
		fuel.SrcRapoportCP: "Rapoport 2010; sports-dietetics practice",
	}
	for src, want := range cases {
		if got := Short(src); got != want {
			t.Errorf("Short(%q) = %q, want %q", src, got, want)
		}
	}
}

func TestStatusOf(t *testing.T) {
	cases := map[string]Status{
		fuel.SrcACSM: Verified, fuel.SrcBands: Verified, fuel.SrcIOC: Verified, fuel.SrcWeir: Verified,
		fuel.SrcBussau: FromMemory, fuel.SrcRomijn: FromMemory, fuel.SrcDensity: FromMemory,
		fuel.SrcCommon: CommonPractice, fuel.SrcRapoportCP: CommonPractice, fuel.SrcModel: ModelAssumption,
	}
	for src, want := range cases {
		if got := StatusOf(src); got != want {
			t.Errorf("StatusOf(%q) = %q, want %q", src, got, want)
		}
	}
}

// Every value of the guideline table is listed with a status and a short
// citation; no short citation carries a status word, which belongs on
// the Sources page only.
func TestRowsCoverTheTable(t *testing.T) {
	rows := Rows()
	if len(rows) != len(fuel.Guidelines) || len(rows) < 50 {
		t.Fatalf("%d rows for %d guideline values", len(rows), len(fuel.Guidelines))
	}
	count := map[Status]int{}
	for i, r := range rows {
		g := fuel.Guidelines[i]
		if r.Key != g.Key || r.Source != g.Source || r.Short == "" || r.Value == "" {
			t.Errorf("row %d: %+v for %+v", i, r, g)
		}
		count[r.Status]++
		for _, w := range []string{"from memory", "common practice", "model assumption", "(review)"} {
			if strings.Contains(strings.ToLower(r.Short), w) {
				t.Errorf("%s: short citation %q says %q", r.Key, r.Short, w)
			}
		}
	}
	for _, st := range Statuses {
		if count[st] == 0 {
			t.Errorf("no value of status %q: the table has them all", st)
		}
	}
	for _, r := range rows {
		if strings.HasPrefix(r.Key, "met.run") && r.Status != FromMemory {
			t.Errorf("%s: activity values from memory listed as %q", r.Key, r.Status)
		}
	}
	if g := fuel.Guidelines[0]; rows[0].Value != strings.TrimSuffix(rows[0].Value, "–") || (g.Min != g.Max && !strings.Contains(rows[0].Value, "–")) {
		t.Errorf("a range printed as %q", rows[0].Value)
	}
}
