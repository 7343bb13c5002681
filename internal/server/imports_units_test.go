package server

import (
	"context"
	"net/url"
	"strings"
	"testing"
)

// A client weighed in pounds reads the import preview in pounds: bare
// numbers are taken as lb, a mass written in kg is shown in lb with what the
// file said, and a mass out of range is refused with the range in lb. The
// rows are stored in kg (1 lb = 0.45359237 kg exactly, International Yard
// and Pound Agreement 1959): 154.3 lb = 69.989 kg → 69.99 kg; 70 kg = 154.3 lb.
func TestImportPreviewInPounds(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn("dietitian")
	c := a.newClient(unique("Pounds Import"))
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE clients SET mass_unit = 'lb' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	cp := "/clients/" + itoa(c.ID)
	csv := "date,body mass,method\n2026-03-01,154.3,scale\n2026-03-02,70 kg,scale\n2026-03-03,700,scale\n"
	res := b.upload(cp+"/import", "body_mass", map[string]string{"mass.csv": csv})
	res.mustRedirect(t, "/imports/")
	page := b.get(res.location)
	page.mustContain(t, `<option value="lb" selected>lb</option>`,
		"2026-03-01 · 154.3 lb · scale",
		"2026-03-02 · 154.3 lb (written as 70 kg) · scale",
		"is outside 44.1 to 661.3 lb (20 to 300 kg)",
		"Import 2 rows")
	if strings.Contains(page.body, "69.99 kg") || strings.Contains(page.body, "written in") {
		t.Errorf("preview of an lb client shows kg first:\n%s", page.body)
	}
	b.post(res.location, url.Values{}).mustRedirect(t, cp)
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1 AND (measured_on, mass_kg) IN (('2026-03-01', 69.99), ('2026-03-02', 70))`, c.ID); n != 2 {
		t.Fatalf("%d rows stored as expected, want 2", n)
	}

	// The same client in a practice-wide file reads in lb beside a kg
	// client (the header names the file's unit: the practice's default may
	// be changed by another test sharing the database).
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE clients SET date_of_birth = '1990-05-06' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	k := a.newClient(unique("Kilo Import"))
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE clients SET date_of_birth = '1991-06-07', mass_unit = 'kg' WHERE id = $1`, k.ID); err != nil {
		t.Fatal(err)
	}
	admin, _ := a.signedIn("admin")
	all := "client,dob,date,mass (kg)\n" + c.Name + ",1990-05-06,2026-04-01,70\n" + k.Name + ",1991-06-07,2026-04-01,60.5\n"
	res = admin.upload("/import", "body_mass", map[string]string{"all.csv": all})
	res.mustRedirect(t, "/imports/")
	admin.get(res.location).mustContain(t, "2026-04-01 · 154.3 lb (written as 70 kg)", "2026-04-01 · 60.5 kg")
}
