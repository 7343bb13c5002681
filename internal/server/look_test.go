package server

import (
	"net/url"
	"strings"
	"testing"

	"larder/internal/store"
)

// Event priorities read in words wherever they appear, and the glycogen
// chart says it is the model's estimate.
func TestPrioritiesInWordsAndModelChart(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	c, e := sheetClient(t, a) // a goal race (priority A)
	cid := itoa64(c.ID)

	b.get("/clients/"+cid).mustContain(t, ">Goal race</td>")
	b.get("/clients/"+cid+"/events/new").mustContain(t, `<option value="A" selected>Goal race</option>`,
		`<option value="B">Important race</option>`, `<option value="C">Training race</option>`)
	b.get("/clients/"+cid+"/plans/new").mustContain(t, ">Goal race</td>")
	res := b.post("/clients/"+cid+"/events", url.Values{"priority": {"D"}})
	res.mustContain(t, "Choose goal race, important race or training race.")

	pid := createPlan(t, b, c.ID, planForm("loading", "58", "event_id", itoa64(e.ID)))
	page := b.get("/clients/" + cid + "/plans/" + itoa64(pid))
	page.mustContain(t, "chart-glycogen", "Estimated glycogen (model)")
	if strings.Contains(page.body, ">Expected glycogen<") {
		t.Error("the glycogen chart keeps its old title")
	}
}
