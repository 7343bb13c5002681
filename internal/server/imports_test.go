package server

import (
	"bytes"
	"context"
	"mime/multipart"
	"net/http"
	"net/url"
	"strings"
	"testing"
)

// upload posts files as a multipart form, as the import page's form does.
func (b *browser) upload(path, kind string, files map[string]string) response {
	b.a.t.Helper()
	var body bytes.Buffer
	mw := multipart.NewWriter(&body)
	_ = mw.WriteField("kind", kind)
	for name, content := range files {
		fw, _ := mw.CreateFormFile("file", name)
		fw.Write([]byte(content))
	}
	mw.Close()
	req, _ := http.NewRequest(http.MethodPost, b.a.srv.URL+path, &body)
	req.Header.Set("Content-Type", mw.FormDataContentType())
	return b.do(req)
}

func TestImportBodyMassFlow(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn("dietitian")
	c := a.newClient(unique("Importer"))
	cp := "/clients/" + itoa(c.ID)
	b.get(cp+"/import").mustContain(t, "Import body mass and training", "Preview the import")

	csv := "Date;Weight (lb);Remark\n01/03/2026;154,3;x\n02/03/2026;155;y\n"
	res := b.upload(cp+"/import", "body_mass", map[string]string{"mass.csv": csv})
	res.mustRedirect(t, "/imports/")
	preview := res.location

	// The date order and the unknown column are asked; nothing is listed yet.
	page := b.get(preview)
	page.mustContain(t, "How is a date like 01/03/2026 meant?", "Column “Remark” holds")
	if strings.Contains(page.body, "id=\"confirm\"") {
		t.Fatal("confirm offered before the questions are answered")
	}
	q := url.Values{"date_order": {"dmy"}, "map_remark": {"ignore"}}
	page = b.get(preview + "?" + q.Encode())
	page.mustContain(t, "2026-03-01 · 69.99 kg (written as 154.3 lb)", `id="confirm"`, "Import 2 rows")
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, c.ID); n != 0 {
		t.Fatalf("the preview saved %d rows", n)
	}
	b.post(preview, q).mustRedirect(t, cp)
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, c.ID); n != 2 {
		t.Fatalf("%d rows saved, want 2", n)
	}
	// The upload is gone once confirmed.
	if got := b.post(preview, q); got.status != http.StatusNotFound {
		t.Fatalf("second confirm: %d", got.status)
	}
	// The same file again adds nothing.
	res = b.upload(cp+"/import", "body_mass", map[string]string{"mass.csv": csv})
	page = b.get(res.location + "?" + q.Encode())
	page.mustContain(t, `id="count-add"><strong>0</strong>`, `id="count-dup"><strong>2</strong>`, "There is nothing to add.")
}

func TestImportRefusals(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn("dietitian")
	c := a.newClient(unique("Refusals"))
	cp := "/clients/" + itoa(c.ID)
	for name, tc := range map[string]struct{ kind, file, content, want string }{
		"binary as csv":  {"body_mass", "x.csv", "PK\x03\x04\x00\x00\x00", "holds binary data"},
		"truncated fit":  {"activity", "ride.fit", "\x0e\x10\x00\x00\x10\x00\x00\x00.FIT\x00\x00\x40", "ride.fit is"},
		"text as gpx":    {"activity", "ride.gpx", "date,mass", "is named .gpx but is not GPX"},
		"practice as dt": {"training", "t.csv", "date,activity,duration\n2026-03-01,curling,30\n", "is not an activity the training log knows"},
	} {
		res := b.upload(cp+"/import", tc.kind, map[string]string{tc.file: tc.content})
		if res.status != http.StatusSeeOther {
			t.Fatalf("%s: upload %d", name, res.status)
		}
		page := b.get(res.location)
		if page.status != http.StatusOK {
			t.Fatalf("%s: preview status %d\n%s", name, page.status, page.body)
		}
		page.mustContain(t, tc.want)
	}
	// Another user cannot open someone's upload.
	res := b.upload(cp+"/import", "body_mass", map[string]string{"m.csv": "date,mass\n2026-03-01,70\n"})
	other, _ := a.signedIn("dietitian")
	if got := other.get(res.location); got.status != http.StatusNotFound {
		t.Fatalf("another user's upload: %d", got.status)
	}
	// A practice-wide import is for admins only.
	if got := b.get("/import"); got.status != http.StatusForbidden {
		t.Fatalf("dietitian on /import: %d", got.status)
	}
}

func TestImportPracticeWide(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn("admin")
	c := a.newClient(unique("Practice Wide"))
	if _, err := a.st.Pool.Exec(context.Background(), `UPDATE clients SET date_of_birth = '1990-05-06' WHERE id = $1`, c.ID); err != nil {
		t.Fatal(err)
	}
	csv := "client,dob,date,mass\n" + c.Name + ",1990-05-06,2026-03-01,60\n" + c.Name + ",1990-05-07,2026-03-02,60\n"
	res := b.upload("/import", "body_mass", map[string]string{"all.csv": csv})
	res.mustRedirect(t, "/imports/")
	page := b.get(res.location)
	page.mustContain(t, "Import 1 rows", "No client is "+c.Name+" (born 1990-05-07)")
	b.post(res.location, url.Values{}).mustRedirect(t, "/clients")
	if n := a.count(`SELECT count(*) FROM body_mass WHERE client_id = $1`, c.ID); n != 1 {
		t.Fatalf("%d rows saved", n)
	}
}

func TestImportTemplate(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn("dietitian")
	res := b.get("/import/template/training.csv")
	if res.status != http.StatusOK || !strings.HasPrefix(res.body, "date,start time,activity,duration (min)") {
		t.Fatalf("%d %q", res.status, res.body)
	}
}
