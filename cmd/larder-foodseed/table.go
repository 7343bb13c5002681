package main

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
)

// row is one food of the composition table, per 100 g edible portion.
type row struct {
	Code, Name, Group                      string
	EnergyKJ, ChoG, ProteinG, FatG, FibreG float64
}

// The package's columns are headed "Label; code"; these are the codes of
// the figures taken (available carbohydrate by difference, protein, total
// fat, total dietary fibre, energy in kJ).
var columns = []string{"code", "name", "grup", "enerc", "choavldf", "protcnt", "fatce", "fibtg"}

func parseIndex(data []byte) (map[string]row, error) {
	r := csv.NewReader(bytes.NewReader(data))
	head, err := r.Read()
	if err != nil {
		return nil, err
	}
	at := map[string]int{}
	for i, h := range head {
		if _, code, ok := strings.Cut(h, "; "); ok {
			at[code] = i
		}
	}
	for _, c := range columns {
		if _, ok := at[c]; !ok {
			return nil, fmt.Errorf("index.csv has no column %q", c)
		}
	}
	out := map[string]row{}
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		num := func(c string) (float64, error) {
			s := strings.TrimSpace(rec[at[c]])
			if s == "" {
				return 0, nil // the table leaves a nutrient not analysed empty
			}
			return strconv.ParseFloat(s, 64)
		}
		x := row{Code: rec[at["code"]], Name: rec[at["name"]], Group: rec[at["grup"]]}
		for _, f := range []struct {
			col string
			v   *float64
		}{{"enerc", &x.EnergyKJ}, {"choavldf", &x.ChoG}, {"protcnt", &x.ProteinG}, {"fatce", &x.FatG}, {"fibtg", &x.FibreG}} {
			if *f.v, err = num(f.col); err != nil {
				return nil, fmt.Errorf("%s %s: %w", x.Code, f.col, err)
			}
		}
		out[x.Code] = x
	}
	return out, nil
}

// pick is a row of starter.csv.
type pick struct {
	Code, Name, Portion string
	PortionG, Yield     float64
	Liquid, Portable    bool
	FODMAP              string // high | low | ?
}

func parsePicks(r io.Reader) ([]pick, error) {
	cr := csv.NewReader(r)
	cr.Comment = '#'
	recs, err := cr.ReadAll()
	if err != nil {
		return nil, err
	}
	var out []pick
	seen := map[string]bool{}
	for i, rec := range recs {
		if i == 0 {
			continue // header
		}
		if len(rec) != 8 {
			return nil, fmt.Errorf("starter line %d: %d fields", i+1, len(rec))
		}
		p := pick{Code: rec[0], Name: rec[1], Portion: rec[2], Liquid: rec[5] == "1", Portable: rec[6] == "1", FODMAP: rec[7]}
		if p.PortionG, err = strconv.ParseFloat(rec[3], 64); err != nil || !(p.PortionG > 0) {
			return nil, fmt.Errorf("%s: portion weight %q", p.Code, rec[3])
		}
		if rec[4] != "" {
			if p.Yield, err = strconv.ParseFloat(rec[4], 64); err != nil || p.Yield < 1 || p.Yield > 10 {
				return nil, fmt.Errorf("%s: cooked yield %q", p.Code, rec[4])
			}
		}
		if p.FODMAP != "high" && p.FODMAP != "low" && p.FODMAP != "?" {
			return nil, fmt.Errorf("%s: fodmap %q is not high, low or ?", p.Code, p.FODMAP)
		}
		if seen[p.Code] {
			return nil, fmt.Errorf("%s chosen twice", p.Code)
		}
		seen[p.Code] = true
		out = append(out, p)
	}
	return out, nil
}

// food is one row of the seed.
type food struct {
	pick
	row
	EnergyKcal     float64
	ContainsGluten bool
	Facts          []string
	FactsRecorded  bool
	Licence        string
}

var (
	glutenWords = regexp.MustCompile(`(?i)\b(wheat|barley|rye|oats?|bulgur|semolina|vermicelli)\b`)
	treeNuts    = regexp.MustCompile(`(?i)\b(almond|cashew|pistachio|walnut|pine|coconut, k)`)
	fishGroups  = map[string]bool{"Marine Fish": true, "Fresh Water Fish and Shellfish": true, "Marine Shellfish": true, "Marine Mollusks": true}
)

// factsOf tells a food's dietary facts from its group and name: gluten for
// wheat, barley, rye and oats and foods made from them; lactose and milk
// protein for milk products; egg; meat (and pork); fish and shellfish;
// peanuts for groundnuts and tree nuts for the nuts (coconut counted with
// them, erring safe); soy for soya beans; animal for every food of animal
// origin (common practice). FODMAP comes from the chosen row.
func factsOf(x row, p pick) (facts []string, gluten bool) {
	add := func(f ...string) { facts = append(facts, f...) }
	if x.Group == "Cereals and Millets" && glutenWords.MatchString(x.Name) {
		add("gluten")
		gluten = true
	}
	switch {
	case x.Group == "Milk and Milk Products":
		add("lactose", "milk_protein", "animal")
	case x.Group == "Egg and Egg Products":
		add("egg", "animal")
	case x.Group == "Poultry" || x.Group == "Animal Meat":
		add("meat", "animal")
		if strings.HasPrefix(x.Name, "Pork") {
			add("pork")
		}
	case fishGroups[x.Group]:
		add("fish_shellfish", "animal")
	case x.Name == "Ground nut":
		add("peanuts")
	case x.Group == "Nuts and Oil Seeds" && treeNuts.MatchString(x.Name):
		add("tree_nuts")
	}
	if strings.HasPrefix(x.Name, "Soya bean") {
		add("soy")
	}
	if p.FODMAP == "high" {
		add("high_fodmap")
	}
	return facts, gluten
}

func build(table map[string]row, picks []pick, licence string) ([]food, error) {
	var out []food
	names := map[string]bool{}
	for _, p := range picks {
		x, ok := table[p.Code]
		if !ok {
			return nil, fmt.Errorf("%s is not in the table", p.Code)
		}
		if sum := x.ChoG + x.ProteinG + x.FatG + x.FibreG; sum > 100.01 {
			return nil, fmt.Errorf("%s %s: its figures add up to %.2f g per 100 g", p.Code, x.Name, sum)
		}
		if k := strings.ToLower(p.Name); names[k] {
			return nil, fmt.Errorf("%s: the name %q is taken", p.Code, p.Name)
		} else {
			names[k] = true
		}
		f := food{pick: p, row: x, EnergyKcal: math.Round(x.EnergyKJ/4.184*10) / 10, FactsRecorded: p.FODMAP != "?",
			Licence: licence + " (npm " + pkgName + " " + pkgVersion + ")"}
		f.Facts, f.ContainsGluten = factsOf(x, p)
		out = append(out, f)
	}
	return out, nil
}

type provenance struct{ Licence, IndexSHA256 string }

func (p provenance) lines() []string {
	return []string{
		"Generated by go run ./cmd/larder-foodseed from testdata/ifct2017/starter.csv; do not edit by hand.",
		"Figures: Indian Food Composition Tables 2017 (Longvah T, Ananthan R, Bhaskarachary K, Venkaiah K;",
		"National Institute of Nutrition, Hyderabad), from the npm package " + pkgName + " " + pkgVersion + ",",
		"licence " + p.Licence + " (copyright 2018-22 Subhajit Sahu); file index.csv, sha256 " + p.IndexSHA256 + ".",
		"Per 100 g edible portion as weighed in the table: available carbohydrate by difference (choavldf),",
		"protein (protcnt), total fat (fatce), total dietary fibre (fibtg); energy is the table's kJ (enerc) / 4.184.",
		"Names, portions, cooked yields and FODMAP status are this practice's (starter.csv).",
	}
}

func num(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

func writeSeed(w io.Writer, foods []food, prov provenance) error {
	for _, l := range prov.lines() {
		if _, err := fmt.Fprintln(w, "# "+l); err != nil {
			return err
		}
	}
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"code", "name", "source_name", "group", "carbohydrate_g", "protein_g", "fat_g", "fibre_g", "energy_kj", "energy_kcal",
		"portion_name", "portion_g", "cooked_yield", "liquid", "portable", "contains_gluten", "facts", "facts_recorded", "licence"})
	for _, f := range foods {
		y := ""
		if f.Yield > 0 {
			y = num(f.Yield)
		}
		_ = cw.Write([]string{f.pick.Code, f.pick.Name, f.row.Name, f.Group, num(f.ChoG), num(f.ProteinG), num(f.FatG), num(f.FibreG),
			num(f.EnergyKJ), num(f.EnergyKcal), f.Portion, num(f.PortionG), y, strconv.FormatBool(f.Liquid), strconv.FormatBool(f.Portable),
			strconv.FormatBool(f.ContainsGluten), strings.Join(f.Facts, " "), strconv.FormatBool(f.FactsRecorded), f.Licence})
	}
	cw.Flush()
	return cw.Error()
}

func quote(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }

// writeSQL writes the migration that adds the starter foods a practice
// does not have yet: a row whose code is already on the list (seeded
// earlier, or added by the practice) is left alone, and so is one whose
// name another active food has.
func writeSQL(w *bytes.Buffer, foods []food, prov provenance) {
	for _, l := range prov.lines() {
		w.WriteString("-- " + l + "\n")
	}
	w.WriteString(`-- Adds the starter foods a practice does not have yet; rows already on the list
-- (by code) and names another active food has are left alone.

-- +goose Up
INSERT INTO foods (source, name, source_name, carbohydrate_g, protein_g, fat_g, fibre_g, energy_kcal,
    portion_name, portion_g, cooked_yield, liquid, portable, contains_gluten, facts, facts_recorded)
SELECT v.source, v.name, v.source_name, v.cho, v.protein, v.fat, v.fibre, v.kcal, v.portion, v.portion_g, v.yield,
    v.liquid, v.portable, v.gluten, v.facts::text[], v.recorded
FROM (VALUES
`)
	for i, f := range foods {
		y := "NULL::numeric"
		if f.Yield > 0 {
			y = num(f.Yield)
		}
		sep := ","
		if i == len(foods)-1 {
			sep = ""
		}
		fmt.Fprintf(w, "    (%s, %s, %s, %s, %s, %s, %s, %s, %s, %s, %s, %t, %t, %t, '{%s}', %t)%s\n",
			quote(f.pick.Code), quote(f.pick.Name), quote(f.row.Name), num(f.ChoG), num(f.ProteinG), num(f.FatG), num(f.FibreG), num(f.EnergyKcal),
			quote(f.Portion), num(f.PortionG), y, f.Liquid, f.Portable, f.ContainsGluten, strings.Join(f.Facts, ","), f.FactsRecorded, sep)
	}
	w.WriteString(`) AS v (source, name, source_name, cho, protein, fat, fibre, kcal, portion, portion_g, yield, liquid, portable, gluten, facts, recorded)
WHERE NOT EXISTS (SELECT 1 FROM foods f WHERE f.source = v.source)
  AND NOT EXISTS (SELECT 1 FROM foods f WHERE f.archived_at IS NULL AND lower(f.name) = lower(v.name));

-- +goose Down
-- The rows added here cannot be told from the practice's later edits of them; they stay.
SELECT 1;
`)
}
