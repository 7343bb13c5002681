package server

import (
	"context"
	"fmt"
	"math"
	"net/http"
	"strings"
	"time"

	"larder/internal/mass"

	"github.com/a-h/templ"

	"larder/internal/chart"
	"larder/internal/fuel"
	"larder/internal/menu"
	"larder/internal/sheet"
	"larder/internal/sources"
	"larder/internal/store"
	"larder/web"
)

// planView turns a stored version into what the plan page prints: numbers
// formatted, findings placed beside the value each concerns, charts drawn,
// food suggestions placed. No figure is computed here; they all come from the
// engine's plan.
//
// Every version, draft or not, shows the food suggestions stored with its
// feeds (stored): they are made when the version is created or saved, and
// are what the client link, the calendar and the plan sheet show too.
func (s *Server) planView(c store.Client, p store.Plan, v store.PlanVersion, versions []store.PlanVersion, stored map[string]string) web.PlanView {
	pv := s.planHead(c, p, v, versions)
	s.planDetailView(&pv, c, p, v, stored)
	return pv
}

// planHead is the part of planView above the plan's body (PlanDetail): the
// title, links, body figures and versions. It reads what can change on a
// frozen version too (its status, the versions list, today's date), so it
// is built anew for every view.
func (s *Server) planHead(c store.Client, p store.Plan, v store.PlanVersion, versions []store.PlanVersion) web.PlanView {
	plan := v.Result
	loc := loadZone(plan.TimeZone)
	pv := web.PlanView{
		ClientID: c.ID, ClientName: c.Name, ClientCautions: c.Cautions, PlanID: p.ID, Title: p.Title,
		KindLabel: kindLabel(p.Kind), Protocol: p.Protocol, TimeZone: plan.TimeZone,
		Version: v.Version, Status: v.Status, Revision: v.Revision, Editable: v.Status == store.PlanDraft,
		ActionURL:        web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version),
		ReviseURL:        web.Path("clients", c.ID, "plans", p.ID, "revise"),
		DiscardURL:       web.Path("clients", c.ID, "plans", p.ID, "versions", v.Version, "discard"),
		Caution:          plan.Caution,
		Tolerance:        "±10 % or ±5 g, whichever is larger",
		ProteinTolerance: "±20 % or ±5 g, whichever is larger", ProteinFrom: web.Num(menu.MinProteinAwareG, 0),
		MassName: massName, FatName: fatName, MassUnitName: massUnitName,
	}
	if pv.Caution == "" {
		pv.Caution = fuel.Caution
	}
	if pv.TimeZone == "" {
		pv.TimeZone = "UTC"
	}
	if e := v.Request.Event; e != nil {
		pv.EventLabel = "start " + e.StartsAt.In(loc).Format("Mon 2 Jan 2006 15:04")
	}
	hasDraft := false
	for _, x := range versions {
		if x.Status == store.PlanDraft {
			hasDraft = true
			if x.ID != v.ID {
				pv.DraftURL = web.Path("clients", c.ID, "plans", p.ID, "versions", x.Version)
			}
		}
		by := x.CreatedByName
		if by == "" {
			by = "Larder (demo loader or command line)"
		}
		vv := web.VersionView{Number: x.Version, Status: x.Status, CreatedBy: by,
			CreatedAt: x.CreatedAt.In(loc).Format("Mon 2 Jan 2006 15:04"), Current: x.ID == v.ID,
			URL: web.Path("clients", c.ID, "plans", p.ID, "versions", x.Version), PublishedAt: "—"}
		if x.PublishedAt != nil {
			vv.PublishedAt = x.PublishedAt.In(loc).Format("Mon 2 Jan 2006 15:04")
		}
		pv.Versions = append(pv.Versions, vv)
	}
	pv.Revisable = v.Status == store.PlanPublished && !hasDraft

	pv.BodyMass = mass.Precise(v.BodyMassKg, c.Unit)
	if v.BodyMassOn != nil {
		pv.BodyMass += ", measured " + web.Date(*v.BodyMassOn)
		if age := int(s.Today().Sub(*v.BodyMassOn).Hours() / 24); age > staleMassDays && v.Status == store.PlanDraft {
			pv.BodyMassWarning = fmt.Sprintf("%d days old: weigh again and update the body mass here, or check it, before publishing.", age)
		}
	} else {
		pv.BodyMass += ", typed in for this plan"
	}
	switch plan.FatFreeMassMethod {
	case fuel.FFMNone, "":
		pv.FatFreeMass = "not known (no body fat or height on record)"
	default:
		pv.FatFreeMass = mass.Text(plan.FatFreeMassKg, c.Unit) + " (" + plan.FatFreeMassMethod + ")"
	}

	return pv
}

// planDetailView fills what PlanDetail shows, and the plan's own findings
// (PlanFindings, with every finding that has no place in the body). It
// reads the version's content, the client's mass unit, the ids in its links
// and the stored food suggestions, nothing else: planDetailKey relies on it.
func (s *Server) planDetailView(pv *web.PlanView, c store.Client, p store.Plan, v store.PlanVersion, stored map[string]string) {
	plan := v.Result
	loc := loadZone(plan.TimeZone)
	// Findings by the value they concern; any whose subject has no place on
	// the page goes with the plan's own, so none is ever dropped.
	bySubject := map[string][]web.FindingView{}
	var order []string
	for _, f := range plan.Findings {
		if _, seen := bySubject[f.Subject]; !seen {
			order = append(order, f.Subject)
		}
		f.Message = sheet.FindingMessage(f, c.Unit)
		bySubject[f.Subject] = append(bySubject[f.Subject], findingView(f))
	}
	placed := map[string]bool{}
	take := func(subject string) []web.FindingView {
		placed[subject] = true
		return bySubject[subject]
	}

	training := trainingByDate(v.Request.Training)
	overriddenFeeds := map[string]bool{}
	for _, o := range v.Request.FeedOverrides {
		overriddenFeeds[fmt.Sprintf("%s_%d", o.Date, o.Index)] = true
	}
	suggestions := stored
	var bars []chart.DayTarget
	for _, d := range plan.Days {
		dv := web.DayView{
			Date: d.Date, DateLabel: dayWords(d.Date), Role: d.Role, Training: training[d.Date],
			LoadBand: bandWords(d.LoadBand), GPerKg: web.Num(d.ChoGPerKg, 1), ChoG: web.Num(d.ChoG, 0),
			ProteinG: web.Num(d.ProteinG, 0), FatG: web.Num(d.FatG, 0), EnergyKcal: web.Num(d.EnergyKcal, 0),
			Occasions: fmt.Sprint(len(d.Feeds)), GPerKgName: gkgName(d.Date), OccasionsName: occName(d.Date),
			Overridden: d.Overridden, LowFibre: d.LowFibre, Advice: d.Advice,
			Findings: take("day:" + d.Date),
		}
		if dv.Training == "" {
			dv.Training = "rest"
			if d.TrainingMin > 0 {
				dv.Training = web.Num(d.TrainingMin, 0) + " min"
			}
		}
		if d.BandMaxGPerKg > 0 {
			dv.Band = web.Num(d.BandMinGPerKg, 1) + "–" + web.Num(d.BandMaxGPerKg, 1) + " g/kg"
			if d.Role == fuel.RoleLoad {
				// The day is checked against the loading range, not its training band.
				dv.Band = "carbohydrate loading " + dv.Band
			}
		}
		for i, fd := range d.Feeds {
			fv := web.FeedView{
				TimeName: feedAtName(d.Date, i), ChoName: feedChoName(d.Date, i),
				Time: fd.At.In(loc).Format("15:04"), Label: fd.Label,
				ChoG: web.Num(fd.ChoG, 0), ProteinG: web.Num(fd.ProteinG, 0),
				Overridden: fd.Overridden || overriddenFeeds[fmt.Sprintf("%s_%d", d.Date, i)],
				Suggestion: suggestions[store.FeedKey("day", d.Date, i)], Key: store.FeedKey("day", d.Date, i),
				Findings: take(fmt.Sprintf("feed:%s:%d", d.Date, i)),
			}
			dv.Feeds = append(dv.Feeds, fv)
		}
		pv.Days = append(pv.Days, dv)
		bars = append(bars, chart.DayTarget{Label: dayLabelShort(d.Date), GPerKg: d.ChoGPerKg,
			BandMin: d.BandMinGPerKg, BandMax: d.BandMaxGPerKg, Overridden: d.Overridden})
	}
	if len(bars) > 0 {
		if svg, err := s.gPerKgSVG(bars); err == nil {
			pv.GPerKgChart = svg
		} else {
			s.Log.Warn("g/kg chart", "plan", p.ID, "err", err)
		}
	}
	if m := plan.PreEventMeal; m != nil {
		pv.PreEvent = &web.Fact{Label: "Pre-event meal",
			Value: fmt.Sprintf("%s g carbohydrate (%s g/kg) at %s, %s h before the start",
				web.Num(m.ChoG, 0), web.Num(m.ChoGPerKg, 1), m.At.In(loc).Format("15:04"), web.Num(m.HoursBefore, 1)),
			Findings: take("pre_event_meal")}
		if sg := suggestions[store.FeedKey("pre_event", menu.FeedDate(plan, m.At), 0)]; sg != "" {
			pv.PreEvent.Hint = "For example: " + sg
			if menu.IsChoice(sg) {
				pv.PreEvent.Hint = sg
			}
		}
	}
	if d := plan.DuringEvent; d != nil {
		pv.During = &web.Fact{Label: fmt.Sprintf("In-event carbohydrate over %s (%s g in all)", hoursWords(d.DurationMin), web.Num(d.TotalChoG, 0)),
			Value: web.Num(d.ChoGPerH, 0), Overridden: d.Overridden, Findings: take("during_event")}
		pv.DuringName = duringName
		// The in-event feed's stored food plan, the one the day table shows.
		for _, day := range plan.Days {
			for i, fd := range day.Feeds {
				if fd.Label == "during event" {
					if sg := suggestions[store.FeedKey("day", day.Date, i)]; sg != menu.NoFit {
						pv.DuringSugg = sg
					}
				}
			}
		}
	}
	pv.Race = raceParts(plan, loc, take)
	if g := plan.Glycogen; g != nil {
		pv.Glycogen = append(pv.Glycogen, web.Fact{Label: "Expected glycogen at the start",
			Value:    fmt.Sprintf("muscle %s g of %s g possible%s; liver %s g", web.Num(g.MuscleGStart, 0), web.Num(g.MuscleGCapacity, 0), density(g.WorkingMuscleMmolPerKgStart), web.Num(g.LiverGStart, 0)),
			Findings: take("glycogen")})
		if g.UsualIntakeMuscleGStart != nil {
			pv.Glycogen[0].Hint = "With the athlete’s usual intake instead of this plan: muscle " + web.Num(*g.UsualIntakeMuscleGStart, 0) + " g."
		}
		out := web.Fact{Label: "Where stores would run out"}
		switch {
		case g.RunsOutAtMin == nil && g.RunsOutWithIntakeAtMin == nil:
			out.Value = "They last the whole event."
		default:
			out.Value = "Without intake: " + runsOut(g.RunsOutAtKm, g.RunsOutAtMin) + ". With the planned intake: " + runsOut(g.RunsOutWithIntakeAtKm, g.RunsOutWithIntakeAtMin) + "."
		}
		pv.Glycogen = append(pv.Glycogen, out)
		if len(g.Curve) > 0 && v.Request.Event != nil {
			pv.GlycogenChart = s.glycogenChart(g.Curve, v.Request.Event.StartsAt, "event start", loc)
		}
	}
	if plan.ExpectedMassGainKg != nil {
		hi := *plan.ExpectedMassGainKg
		if plan.ExpectedMassGainKgMax != nil {
			hi = *plan.ExpectedMassGainKgMax
		}
		pv.MassGain = mass.Difference(*plan.ExpectedMassGainKg, hi, c.Unit)
	}
	if rp := plan.Repletion; rp != nil {
		val := fmt.Sprintf("%s h between sessions. ", web.Num(rp.GapH, 1))
		if rp.Speedy {
			val += fmt.Sprintf("Speedy refuelling: %s g/kg/h for the first hours.", web.Num(rp.ChoGPerKgPerH, 1))
		} else {
			val += "Long enough for the day’s normal targets; no speedy protocol."
		}
		pv.Repletion = &web.Fact{Label: "Repletion window", Value: val, Findings: take("repletion"),
			Hint: fmt.Sprintf("Expected muscle glycogen at the next start: %s g of %s g possible%s.", web.Num(rp.MuscleGAtNextStart, 0), web.Num(rp.MuscleGCapacity, 0), density(rp.WorkingMuscleMmolPerKgAtNextStart))}
		if rp.WorkingMuscleMmolPerKgAtEnd > 0 {
			pv.Repletion.Hint += " Working muscle at the session’s end: " + web.Num(rp.WorkingMuscleMmolPerKgAtEnd, 0) + " mmol/kg."
		}
		for i, fd := range rp.Feeds {
			date := menu.FeedDate(plan, fd.At)
			pv.RepletionFeeds = append(pv.RepletionFeeds, web.FeedView{
				Time: fd.At.In(loc).Format("Mon 15:04"), Label: fd.Label, ChoG: web.Num(fd.ChoG, 0), ProteinG: web.Num(fd.ProteinG, 0),
				Overridden: fd.Overridden, Suggestion: suggestions[store.FeedKey("repletion", date, i)], Key: store.FeedKey("repletion", date, i),
				Findings: take(fmt.Sprintf("repletion_feed:%d", i)),
			})
		}
		if len(rp.Curve) > 0 && pv.GlycogenChart == nil && v.Request.NextStart != nil {
			pv.GlycogenChart = s.glycogenChart(rp.Curve, *v.Request.NextStart, "next session", loc)
		}
	}
	pv.PlanFindings = take("plan")
	for _, subj := range order {
		if !placed[subj] {
			pv.PlanFindings = append(pv.PlanFindings, bySubject[subj]...)
		}
	}
}

func (s *Server) glycogenChart(curve []fuel.GlycogenPoint, start time.Time, label string, loc *time.Location) []byte {
	// A few hundred points draw a smooth curve; a 14-day simulation in
	// 5-minute steps has thousands.
	step := len(curve)/300 + 1
	var pts []chart.GlycogenPoint
	for i := 0; i < len(curve); i += step {
		pts = append(pts, chart.GlycogenPoint{At: curve[i].At.In(loc), MuscleG: curve[i].MuscleG, LiverG: curve[i].LiverG})
	}
	if last := curve[len(curve)-1]; (len(curve)-1)%step != 0 {
		pts = append(pts, chart.GlycogenPoint{At: last.At.In(loc), MuscleG: last.MuscleG, LiverG: last.LiverG})
	}
	svg, err := s.glycogenSVG(pts, start.In(loc), label)
	if err != nil {
		s.Log.Warn("glycogen chart", "err", err)
		return nil
	}
	return svg
}

func runsOut(km, min *float64) string {
	switch {
	case min == nil:
		return "they last"
	case km != nil:
		return "at about " + web.Num(*km, 1) + " km (" + hoursWords(*min) + ")"
	default:
		return "after about " + hoursWords(*min)
	}
}

func hoursWords(min float64) string {
	total := int(math.Round(min))
	h, m := total/60, total%60
	if h == 0 {
		return fmt.Sprintf("%d min", m)
	}
	return fmt.Sprintf("%d h %02d min", h, m)
}

func findingView(f fuel.Finding) web.FindingView {
	return web.FindingView{Level: f.Level, Symbol: web.LevelSymbol(f.Level), Word: web.LevelWord(f.Level),
		Message: f.Message, Source: sources.Short(f.Source), Code: f.Code}
}

func bandWords(band string) string {
	switch band {
	case "very-high":
		return "very high"
	case "":
		return "—"
	}
	return band
}

func dayLabelShort(date string) string {
	t, err := time.Parse(time.DateOnly, date)
	if err != nil {
		return date
	}
	return t.Format("Mon 2")
}

func trainingByDate(ts []fuel.TrainingSession) map[string]string {
	out := map[string]string{}
	for _, t := range ts {
		s := store.ModalityLabel(t.Modality) + " " + web.Num(t.DurationMin, 0) + " min"
		if t.Intensity != "" {
			s += " (" + intensityWords(t.Intensity) + ")"
		}
		if t.Start != "" {
			s = t.Start + " " + s
		}
		if out[t.Date] != "" {
			out[t.Date] += "; "
		}
		out[t.Date] += s
	}
	return out
}

func intensityWords(x string) string {
	if v, ok := strings.CutPrefix(x, "rpe:"); ok {
		return "RPE " + v
	}
	if v, ok := strings.CutPrefix(x, "pct:"); ok {
		return v + "% VO2max"
	}
	return x
}

// menuOptions is what the client's record asks of every suggestion: the
// recorded dietary needs, and until they are confirmed the needs that the
// recorded cautions name.
func (s *Server) menuOptions(ctx context.Context, c store.Client) (menu.Options, error) {
	d, err := s.Store.ClientDietaryNeeds(ctx, c.ID)
	if err != nil {
		return menu.Options{}, err
	}
	return menu.OptionsForClient(c.Cautions, d.Codes, d.Confirmed()), nil
}

// planSuggestions makes a plan's food suggestions from the current foods
// list and the client's dietary needs, as a save stores them with the feeds.
func (s *Server) planSuggestions(ctx context.Context, c store.Client, plan fuel.Plan) (map[string]string, error) {
	foods, err := s.Store.ListFoods(ctx, false)
	if err != nil {
		return nil, err
	}
	opts, err := s.menuOptions(ctx, c)
	if err != nil {
		return nil, err
	}
	return menu.PlanSuggestions(plan, MenuFoods(foods), opts), nil
}

// ----- client page hooks -----

// clientPlansSection is the plans box of the client page: the client's
// plans, and the plans that can be started from their events and training
// (newest first: the client page's window of the log, which reaches back
// further than the past week this looks at).
func (s *Server) clientPlansSection(c store.Client, plans []store.PlanRow, events []store.Event, training []store.TrainingSession) templ.Component {
	v := web.ClientPlansView{ClientID: c.ID}
	for _, p := range plans {
		line := web.ClientPlanLine{URL: web.Path("clients", c.ID, "plans", p.ID), Title: p.Title, Kind: kindLabel(p.Kind),
			Status: p.LatestStatus, Version: p.LatestVersion, Updated: web.Date(p.UpdatedAt), Published: "—"}
		if p.PublishedVersion != nil {
			line.Published = "version " + fmt.Sprint(*p.PublishedVersion)
		}
		v.Plans = append(v.Plans, line)
	}
	base := web.Path("clients", c.ID, "plans", "new")
	for _, e := range events {
		if e.StartsAt.After(s.Now()) {
			v.Starts = append(v.Starts,
				web.Option{Value: base + "?kind=loading&event=" + web.ID(e.ID), Label: "Loading plan for " + e.Name},
				web.Option{Value: base + "?kind=race&event=" + web.ID(e.ID), Label: "Race-day plan for " + e.Name})
		}
	}
	repletion := web.Option{Value: base + "?kind=repletion", Label: "Repletion plan"}
	// Offer repletion after the latest session with a start time, so the
	// form comes prefilled with its end and the next session's start.
	// The log is newest first, so the first session of the past week with a
	// start time is the latest one.
	today := s.Today()
	weekAgo := today.AddDate(0, 0, -7)
	for _, t := range training {
		if t.OnDate.After(today) || t.OnDate.Before(weekAgo) || t.StartTime == "" {
			continue
		}
		repletion = web.Option{Value: base + "?kind=repletion&training=" + web.ID(t.ID),
			Label: "Repletion after " + t.OnDate.Format("Mon 2 Jan") + " " + t.StartTime}
		break
	}
	v.Starts = append(v.Starts,
		repletion,
		web.Option{Value: base + "?kind=week", Label: "Training-week plan"})
	return web.ClientPlans(v)
}

func (s *Server) clientBodyMassChart(r *http.Request, c store.Client, history []store.BodyMass) (templ.Component, error) {
	if len(history) < 2 {
		return nil, nil
	}
	pts := make([]chart.MassPoint, 0, len(history))
	for i := len(history) - 1; i >= 0; i-- { // history is newest first
		pts = append(pts, chart.MassPoint{On: history[i].MeasuredOn, Kg: history[i].MassKg})
	}
	svg, err := s.bodyMassSVG(pts, c.Unit)
	if err != nil {
		return nil, err
	}
	return web.ChartFigure(svg, "chart-body-mass", "Body mass over time."), nil
}

// density is the working muscle's glycogen density beside the grams, in
// the unit studies report; plans stored before it was computed have none.
func density(mmolPerKg float64) string {
	if mmolPerKg <= 0 {
		return ""
	}
	return " (working muscle " + web.Num(mmolPerKg, 0) + " mmol/kg wet muscle)"
}
