package server

import (
	"context"
	"math"
	"net/url"
	"strings"
	"testing"

	"larder/internal/store"
)

// A session's average heart rate and power are typed on the training form,
// listed where recorded, and the power of a ride reaches the plans made
// from the log.
func TestTrainingHeartRateAndPower(t *testing.T) {
	a := newApp(t)
	b, _ := a.signedIn(store.RoleDietitian)
	ctx := context.Background()
	c := a.newClient(unique("Power Rider"))
	base := "/clients/" + itoa(c.ID)
	ride := url.Values{"on_date": {"2027-03-02"}, "start_time": {"09:00"}, "modality": {"cycle"}, "duration_min": {"120"},
		"intensity_kind": {"zone"}, "zone": {"endurance"}, "status": {"planned"}}

	bad := cloneValues(ride)
	bad.Set("avg_power_w", "5000")
	bad.Set("avg_heart_rate", "fast")
	b.post(base+"/training", bad).mustContain(t, "Average power must be", "2000", "Average heart rate must be a whole number.")
	if n := a.count(`SELECT count(*) FROM training_sessions WHERE client_id = $1`, c.ID); n != 0 {
		t.Fatalf("a refused session was saved (%d rows)", n)
	}

	good := cloneValues(ride)
	good.Set("avg_power_w", "200")
	good.Set("avg_heart_rate", "141")
	b.post(base+"/training", good).mustRedirect(t, base)
	list, err := a.st.ListTraining(ctx, c.ID)
	if err != nil || len(list) != 1 || list[0].AvgPowerW == nil || *list[0].AvgPowerW != 200 || list[0].AvgHeartRate == nil || *list[0].AvgHeartRate != 141 {
		t.Fatalf("stored %+v %v", list, err)
	}
	b.get(base).mustContain(t, "<th class=\"num\">Average heart rate</th>", "<th class=\"num\">Average power</th>", "141 beats/min", "200 W")
	b.get(base+"/training/"+itoa(list[0].ID)+"/edit").mustContain(t, `value="200"`, `value="141"`)

	// A week plan from the log: the ride's energy is the work done.
	planID := createPlan(t, b, c.ID, planForm("week", "70", "start_date", "2027-03-02", "days", "3"))
	v := latestVersion(t, a, planID)
	var found bool
	for _, s := range v.Request.Training {
		if s.Date == "2027-03-02" && s.AveragePowerW != nil && *s.AveragePowerW == 200 {
			found = true
		}
	}
	if !found {
		t.Fatalf("the plan's request lost the ride's power: %+v", v.Request.Training)
	}
	day := v.Result.Days[0]
	// common practice: 1 kJ of mechanical work ≈ 1 kcal expended (gross
	// efficiency ≈ 24%); 200 W for 2 h is 1440 kJ → about 1440 kcal.
	if day.Date != "2027-03-02" || day.ExerciseEnergyKcal == nil || math.Abs(*day.ExerciseEnergyKcal-1440) > 1440*0.02 {
		t.Fatalf("day %s exercise energy %v, want about 1440 kcal", day.Date, day.ExerciseEnergyKcal)
	}

	// A log without either figure lists no such columns.
	other := a.newClient(unique("No Meter"))
	ob := "/clients/" + itoa(other.ID)
	plain := cloneValues(ride)
	plain.Set("modality", "run")
	b.post(ob+"/training", plain).mustRedirect(t, ob)
	if page := b.get(ob); strings.Contains(page.body, "Average power") || strings.Contains(page.body, "Average heart rate</th>") {
		t.Fatal("the training list shows empty heart-rate or power columns")
	}
}

func cloneValues(v url.Values) url.Values {
	out := url.Values{}
	for k, vs := range v {
		out[k] = append([]string(nil), vs...)
	}
	return out
}
