package fuel

import (
	"math"
	"strconv"
	"strings"
	"time"
)

// finish checks every figure of the plan and fills what JSON must not
// leave empty.
func (p *planner) finish() {
	mass := p.body.MassKg
	switch {
	case p.body.FFMMethod == FFMNone && p.req.Athlete.HeightCm != nil:
		p.find("fat-free-mass-unknown", LevelNote, "plan", SrcBoer,
			"Height was given, but the Boer estimate of lean mass from it (%.1M) is not between 0 and the body mass of %M, so it cannot be used: fat-free mass is not known and energy availability is only screened on an estimate. Measure body fat for both.",
			MassFigure{Kg: p.body.BoerKg}, MassFigure{Kg: mass})
	case p.body.FFMMethod == FFMNone:
		p.find("fat-free-mass-unknown", LevelNote, "plan", SrcBoer,
			"Neither body fat nor height was given, so fat-free mass is not known and energy availability is only screened on an estimate. Measure body fat for both.")
	}
	p.checkBodyFat()
	for i := range p.plan.Days {
		p.checkDay(&p.plan.Days[i])
	}
	for _, o := range p.req.Overrides {
		found := false
		for _, d := range p.plan.Days {
			found = found || d.Date == o.Date
		}
		if !found {
			p.find("override-unused", LevelNote, "plan", SrcCommon,
				"The override for %s was not applied: that day is not in this plan.", o.Date)
		}
	}
	for i, o := range p.req.FeedOverrides {
		switch {
		case p.feedOvState == nil || p.feedOvState[i] == "":
			p.find("feed-override-unused", LevelNote, "plan", SrcCommon,
				"The feed override for %s was not applied: that day is not in this plan.", o.Date)
		case p.feedOvState[i] != feedOvApplied:
			p.find("feed-override-unused", LevelNote, "day:"+o.Date, SrcCommon, "%s", p.feedOvState[i])
		}
	}
	if pm := p.plan.PreEventMeal; pm != nil {
		lvl, word := LevelOK, "inside"
		if !inRange(pm.ChoGPerKg, gPreEventCho.Min, gPreEventCho.Max) || !inRange(pm.HoursBefore, gPreEventHours.Min, gPreEventHours.Max) {
			lvl, word = LevelOutside, "outside"
		}
		p.find("pre-event-meal", lvl, "pre_event_meal", SrcACSM,
			"Pre-event meal of %g g/kg (%g g) %g h before the start%s: %s the guideline of %g–%g g/kg, %g–%g h before.",
			pm.ChoGPerKg, pm.ChoG, pm.HoursBefore, overrideWord(p.preMealOverridden()), word,
			gPreEventCho.Min, gPreEventCho.Max, gPreEventHours.Min, gPreEventHours.Max)
		if p.preMealNight {
			p.find("pre-event-meal-night", LevelNote, "pre_event_meal", SrcACSM,
				"The start at %s leaves no time for the pre-event meal outside the night hours (before 05:00): it is set %g h before, at %s; plan the early rise, or a larger meal the evening before.",
				p.evStart.Format("15:04"), pm.HoursBefore, pm.At.Format("15:04"))
		}
		if pm.At.Format("2006-01-02") != p.evDayDate {
			p.find("pre-event-meal-day", LevelNote, "pre_event_meal", SrcACSM,
				"The start at %s is early on %s, so the pre-event meal, %g h before, is the evening before: %s at %s, listed on that day.",
				p.evStart.Format("15:04"), p.evDayDate, pm.HoursBefore, pm.At.Format("2006-01-02"), pm.At.Format("15:04"))
		}
	} else if p.ev != nil {
		p.find("pre-event-meal-not-needed", LevelNote, "pre_event_meal", SrcACSM,
			"The pre-event meal guideline (%g–%g g/kg, %g–%g h before) is for exercise over %g min; a usual light meal suits this %g-min event.",
			gPreEventCho.Min, gPreEventCho.Max, gPreEventHours.Min, gPreEventHours.Max, gPreEventMin.Min, p.ev.ExpectedDurationMin)
	}
	if de := p.plan.DuringEvent; de != nil {
		p.checkDuring(de)
	}
	if g := p.plan.Glycogen; g != nil && p.ev != nil {
		p.checkGlycogen(g)
	}
	if r := p.plan.Repletion; r != nil {
		p.checkRepletion(r)
	}
	if p.plan.ExpectedMassGainKg != nil {
		p.find("mass-gain", LevelNote, "plan", SrcOlsson,
			"Expect body mass at the start to be about %M above the usual diet's: about %.0f g more glycogen, stored with %g–%g g of water per gram. Expected, not a sign of fat gain.",
			MassFigure{Kg: *p.plan.ExpectedMassGainKg, MaxKg: *p.plan.ExpectedMassGainKgMax}, p.massGainG, gWater.Min, gWater.Max)
	}
	p.finishEvents()
	for _, c := range p.req.Cautions {
		// The sentence adds its own full stop.
		c = strings.TrimRight(strings.TrimSpace(c), ".;, ")
		if c == "" {
			continue
		}
		p.find("client-caution", LevelCaution, "plan", SrcCommon,
			"Recorded caution: %s. This client needs individual clinical care; check every figure of this plan with their medical team.", c)
	}
	if p.plan.Days == nil {
		p.plan.Days = []Day{}
	}
	_ = mass
}

func (p *planner) preMealOverridden() bool {
	for _, d := range p.plan.Days {
		for _, f := range d.Feeds {
			if f.Label == labelPreEvent && f.Overridden {
				return true
			}
		}
	}
	return false
}

// rangeCode is the finding code of a day's carbohydrate check.
func rangeCode(role string) string {
	switch role {
	case RoleLoad:
		return "load-day-range"
	case RoleTaper:
		return "taper-day-range"
	case RoleEvent:
		return "event-day-range"
	case RoleRecovery:
		return "recovery-day-range"
	case RoleRepletion:
		return "repletion-day-range"
	}
	return "training-day-range"
}

// bandWords names a load band in a sentence.
func bandWords(b string) string {
	switch b {
	case BandRest:
		return "light (rest day)"
	case BandVeryHigh:
		return "very high"
	}
	return b
}

func (p *planner) checkDay(d *Day) {
	if d.Role == RoleInRace || p.feedOnly[d.Date] {
		p.checkInRaceDay(d)
		return
	}
	mass := p.body.MassKg
	subj := "day:" + d.Date
	code, src, what, band := rangeCode(d.Role), SrcBands, "the %s training-load band", bandWords(d.LoadBand)
	unit := "g/kg/day"
	if d.Role == RoleLoad {
		src, what, band, unit = SrcACSM, "the carbohydrate-loading range%s", "", "g/kg per 24 h"
	}
	switch {
	case inRange(d.ChoGPerKg, d.BandMinGPerKg, d.BandMaxGPerKg):
		p.find(code, LevelOK, subj, src, "Carbohydrate %g g/kg (%g g)%s is inside "+what+" of %g–%g %s.",
			d.ChoGPerKg, d.ChoG, overrideWord(d.Overridden), band, d.BandMinGPerKg, d.BandMaxGPerKg, unit)
	case d.Overridden:
		p.find(code, LevelOutside, subj, src, "Carbohydrate %g g/kg (%g g) is a dietitian's override outside "+what+" of %g–%g %s.",
			d.ChoGPerKg, d.ChoG, band, d.BandMinGPerKg, d.BandMaxGPerKg, unit)
	default:
		p.find(code, LevelOutside, subj, src, "Carbohydrate %g g/kg (%g g) is outside "+what+" of %g–%g %s, because the pre-event meal and in-event fuelling alone need that much.",
			d.ChoGPerKg, d.ChoG, band, d.BandMinGPerKg, d.BandMaxGPerKg, unit)
	}
	if ov := p.dayOverride(d.Date); ov != nil && ov.ChoGPerKg != nil && d.ChoGPerKg > round1(*ov.ChoGPerKg) {
		p.find("override-raised", LevelNote, subj, SrcCommon,
			"The override of %g g/kg is less than the protocol's feeds of this day need (pre-event meal, in-event and recovery feeds); the day carries %g g/kg.",
			round1(*ov.ChoGPerKg), d.ChoGPerKg)
	}
	if d.Role == RoleLoad && p.body.Sex == "female" {
		perFFM := 0.0
		if p.body.FFMKg > 0 {
			perFFM = d.ChoG / p.body.FFMKg
		}
		ea := d.EnergyAvailability
		switch {
		case (d.ChoGPerKg >= gWomenBM.Min || perFFM >= gWomenFFM.Min) && ea != nil && *ea < gEAAdequate.Min:
			// The guide asks for enough total energy as well: checked
			// against adequate energy availability when it is known.
			p.find("women-loading", LevelCaution, subj, SrcSedlock,
				"For a woman loading, %g g/kg body mass meets the carbohydrate guide (over %g g/kg body mass or %g g/kg lean mass), but energy availability of %g kcal/kg FFM/day is under the adequate %g: the guide also asks for enough total energy.",
				d.ChoGPerKg, gWomenBM.Min, gWomenFFM.Min, *ea, gEAAdequate.Min)
		case d.ChoGPerKg >= gWomenBM.Min || perFFM >= gWomenFFM.Min:
			what := "with enough total energy"
			if ea == nil {
				what = "provided total energy is enough (not computed: fat-free mass unknown)"
			}
			p.find("women-loading", LevelOK, subj, SrcSedlock,
				"For a woman loading, %g g/kg body mass meets the guide of over %g g/kg body mass or %g g/kg lean mass, %s.",
				d.ChoGPerKg, gWomenBM.Min, gWomenFFM.Min, what)
		default:
			p.find("women-loading", LevelCaution, subj, SrcSedlock,
				"For a woman loading, %g g/kg body mass is below the guide of over %g g/kg body mass or %g g/kg lean mass.",
				d.ChoGPerKg, gWomenBM.Min, gWomenFFM.Min)
		}
	}
	for _, n := range p.occNotes {
		switch {
		case n.date != d.Date:
		case n.got > n.asked:
			p.find("eating-occasions", LevelNote, subj, SrcACSM,
				"%d eating occasions were asked for on %s, but the day needs at least %d for %s, so it has %d.",
				n.asked, d.Date, n.fixed, n.kinds, n.got)
		default:
			p.find("eating-occasions", LevelNote, subj, SrcCommon,
				"%d eating occasions were asked for on %s, but only %d fit around the training and the protocol's feeds.",
				n.asked, d.Date, n.got)
		}
	}
	prot := math.Round(d.ProteinG/mass*10) / 10
	if inRange(d.ProteinG/mass, gProteinDaily.Min, gProteinDaily.Max) {
		p.find("protein-day", LevelOK, subj, SrcACSM, "Protein %g g (%g g/kg) is inside %g–%g g/kg/day.",
			d.ProteinG, prot, gProteinDaily.Min, gProteinDaily.Max)
	} else {
		p.find("protein-day", LevelOutside, subj, SrcACSM, "Protein %g g (%g g/kg) is outside %g–%g g/kg/day.",
			d.ProteinG, prot, gProteinDaily.Min, gProteinDaily.Max)
	}
	if d.EnergyKcal > 0 {
		share := gAtwaterFat.Min * d.FatG / d.EnergyKcal
		lvl, word := LevelOK, "not below"
		if share < gFatFloor.Min {
			lvl, word = LevelOutside, "below"
		}
		p.find("fat-floor", lvl, subj, SrcACSM, "Fat %g g is %.0f%% of %g kcal, %s the floor of %.0f%% of energy.",
			d.FatG, share*100, d.EnergyKcal, word, gFatFloor.Min*100)
	}
	if ea := d.EnergyAvailability; ea != nil {
		switch {
		case *ea < gEALow.Min && d.Role == RoleEvent:
			// Energy availability is a matter of days and weeks; one event
			// day under it is expected and is made up on the days after.
			p.find("energy-availability", LevelNote, subj, SrcIOC,
				"Energy availability %g kcal/kg FFM/day is low (under %g) on the event day: %g kcal eaten, %g kcal of exercise. One such day is expected; make it up on the days after.",
				*ea, gEALow.Min, d.EnergyKcal, *d.ExerciseEnergyKcal)
		case *ea < gEALow.Min:
			p.find("energy-availability", LevelCaution, subj, SrcIOC,
				"Energy availability %g kcal/kg FFM/day is low (under %g): %g kcal eaten, %g kcal of exercise.",
				*ea, gEALow.Min, d.EnergyKcal, *d.ExerciseEnergyKcal)
		case *ea < gEAAdequate.Min:
			p.find("energy-availability", LevelNote, subj, SrcIOC,
				"Energy availability %g kcal/kg FFM/day is between low (%g) and adequate (about %g).",
				*ea, gEALow.Min, gEAAdequate.Min)
		default:
			p.find("energy-availability", LevelOK, subj, SrcIOC,
				"Energy availability %g kcal/kg FFM/day is adequate (about %g or more).", *ea, gEAAdequate.Min)
		}
	}
	if d.EnergyAvailability == nil && d.ExerciseEnergyKcal != nil && d.EnergyKcal > 0 {
		p.screenEnergyAvailability(d, subj)
	}
	// Feeds: overrides, protein at main meals, long gaps.
	var prevAt time.Time
	for i, f := range d.Feeds {
		fs := func() string { return "feed:" + d.Date + ":" + strconv.Itoa(i) }
		if f.Overridden {
			p.find("feed-override", LevelNote, fs(), SrcCommon,
				"Feed %d (%s at %s) is a dietitian's override: %g g carbohydrate; the other feeds share the rest of the day's %g g.",
				i, f.Label, f.At.Format("15:04"), f.ChoG, d.ChoG)
		}
		switch f.Label {
		case "breakfast", "lunch", "dinner", labelRecovery:
			if f.ProteinG < math.Floor(gProteinMeal.Min*mass*0.8) {
				p.find("protein-meal", LevelNote, fs(), SrcACSM,
					"The %s at %s has %g g protein, under about %g g/kg (%g g) per meal.",
					f.Label, f.At.Format("15:04"), f.ProteinG, gProteinMeal.Min, math.Round(gProteinMeal.Min*mass))
			}
		}
		if f.Label == labelDuring {
			prevAt = p.duringEnd(f) // fed through the event
			continue
		}
		if !prevAt.IsZero() {
			gap := f.At.Sub(prevAt).Hours()
			if gap > gMealEvery.Max {
				p.find("feed-gap", LevelNote, fs(), SrcACSM,
					"%.1f h pass without food before the %s at %s; protein and carbohydrate are best spread every %g–%g h.",
					gap, f.Label, f.At.Format("15:04"), gMealEvery.Min, gMealEvery.Max)
			}
		}
		prevAt = f.At
	}
}

func (p *planner) checkDuring(de *DuringEvent) {
	lo, hi, src := duringBandRange(de.Band)
	ov := overrideWord(de.Overridden)
	switch {
	case de.ChoGPerH > gDuringUpTo90.Max:
		p.find("during-event-band", LevelOutside, "during_event", src,
			"In-event carbohydrate of %g g/h is a dietitian's override above the %g g/h ceiling.", de.ChoGPerH, gDuringUpTo90.Max)
	case de.Band == "none" && de.ChoGPerH == 0:
		p.find("during-event-band", LevelOK, "during_event", SrcACSM,
			"No carbohydrate is needed during this %g-min event (under %g min).", de.DurationMin, gDuringNone.Max)
	case de.Band == "small" && inRange(de.ChoGPerH, lo, hi):
		p.find("during-event-band", LevelOK, "during_event", SrcACSM,
			"%g g/h%s: in a %g-min event small amounts or a carbohydrate mouth rinse are enough.", de.ChoGPerH, ov, de.DurationMin)
	case inRange(de.ChoGPerH, lo, hi):
		p.find("during-event-band", LevelOK, "during_event", src,
			"In-event carbohydrate of %g g/h (%g g in all)%s is inside %g–%g g/h for a %g-min event.",
			de.ChoGPerH, de.TotalChoG, ov, lo, hi, de.DurationMin)
	default:
		p.find("during-event-band", LevelOutside, "during_event", src,
			"In-event carbohydrate of %g g/h%s is outside %g–%g g/h for a %g-min event.", de.ChoGPerH, ov, lo, hi, de.DurationMin)
	}
	// An override above 60 g/h keeps the note: the gut's limit holds
	// whoever sets the rate.
	if de.ChoGPerH > gDuring3060.Max {
		p.find("multiple-transportable", LevelNote, "during_event", SrcACSMJeuk,
			"Over %g g/h needs multiple transportable carbohydrates (glucose with fructose), practised in training.", gDuring3060.Max)
	}
	useGPH := math.Round(p.evUseGPH)
	if p.evPct >= gCoverPct.Max && de.ChoGPerH > 0 {
		p.find("intake-covers-third", LevelNote, "during_event", SrcCommon,
			"At this effort the body uses about %g g of carbohydrate per hour; even the highest practical intake covers only about a third (≈%.0f%%) of it.",
			useGPH, gHardCover.Min*100)
	}
	src2 := SrcAinsworth
	switch {
	case strings.HasPrefix(p.evMethod, "running"):
		src2 = SrcRapoportCP
	case strings.HasPrefix(p.evMethod, "mechanical"):
		src2 = SrcCommon
	case strings.HasPrefix(p.evMethod, "VO2max"):
		src2 = SrcWeir
	}
	p.find("event-energy", LevelNote, "during_event", src2,
		"The event costs about %g kcal (%s); at about %.0f%% of VO2max about %.0f%% of it comes from carbohydrate, %g g in all.",
		de.EnergyKcal, p.evMethod, p.evPct, de.ChoShare*100, de.ChoUsedG)
}

func (p *planner) checkGlycogen(g *Glycogen) {
	d := math.Round(p.startDensity)
	switch {
	case d >= gLoaded.Min:
		p.find("glycogen-start", LevelOK, "glycogen", SrcDensity,
			"Working-muscle glycogen at the start is expected near %g mmol/kg wet muscle: loaded (%g–%g+).", d, gLoaded.Min, gLoaded.Max)
	case d >= gTypical.Min:
		p.find("glycogen-start", LevelNote, "glycogen", SrcDensity,
			"Working-muscle glycogen at the start is expected near %g mmol/kg wet muscle: typical or above (typical %g–%g, loaded %g–%g+).",
			d, gTypical.Min, gTypical.Max, gLoaded.Min, gLoaded.Max)
	default:
		p.find("glycogen-start", LevelCaution, "glycogen", SrcDensity,
			"Working-muscle glycogen at the start is expected near %g mmol/kg wet muscle, below the typical %g–%g.", d, gTypical.Min, gTypical.Max)
	}
	where := func(min, km *float64) string {
		if km != nil {
			return string(appendf(nil, "about %g km (%g min)", *km, *min))
		}
		return string(appendf(nil, "about %g min", *min))
	}
	rate := 0.0
	if p.plan.DuringEvent != nil {
		rate = p.plan.DuringEvent.ChoGPerH
	}
	switch {
	case g.RunsOutAtMin == nil:
		p.find("glycogen-runs-out", LevelOK, "glycogen", SrcRapoport,
			"Stores of %g g in the working muscle and %g g in the liver are expected to last the event even without intake.",
			g.WorkingMuscleGStart, g.LiverGStart)
	case g.RunsOutWithIntakeAtMin == nil:
		p.find("glycogen-runs-out", LevelOK, "glycogen", SrcRapoport,
			"Without intake the stores would run low at %s; with %g g/h they are expected to last to the finish.",
			where(g.RunsOutAtMin, g.RunsOutAtKm), rate)
	default:
		p.find("glycogen-runs-out", LevelCaution, "glycogen", SrcRapoport,
			"Even with %g g/h the stores may run low at %s (at %s without intake): consider a lower pace or longer loading.",
			rate, where(g.RunsOutWithIntakeAtMin, g.RunsOutWithIntakeAtKm), where(g.RunsOutAtMin, g.RunsOutAtKm))
	}
	if g.UsualIntakeMuscleGStart != nil {
		p.find("usual-intake-compare", LevelNote, "glycogen", SrcModel,
			"On the usual training-load intake, muscle glycogen at the start would be about %g g instead of %g g with this plan.",
			*g.UsualIntakeMuscleGStart, g.MuscleGStart)
	}
}

func (p *planner) checkRepletion(r *Repletion) {
	mass := p.body.MassKg
	if !r.Speedy {
		p.find("repletion-not-speedy", LevelNote, "repletion", SrcACSM,
			"%g h separate the sessions, %g h or more: daily targets suffice without speedy refuelling.", r.GapH, gSpeedyGap.Min)
	} else {
		var sum float64
		for _, f := range r.Feeds {
			sum += f.ChoG
		}
		actual := 0.0
		if p.repWinH > 0 {
			actual = math.Round(sum/mass/p.repWinH*100) / 100
		}
		lvl, word := LevelOK, "inside"
		if !inRange(actual, gRepletionRate.Min-0.005, gRepletionRate.Max+0.005) {
			lvl, word = LevelOutside, "outside"
		}
		p.find("repletion-rate", lvl, "repletion", SrcACSM,
			"%g h separate the sessions (under %g h): %g g over the first %g h is %g g/kg/h, %s %g–%g g/kg/h.",
			r.GapH, gSpeedyGap.Min, sum, round1(p.repWinH), actual, word, gRepletionRate.Min, gRepletionRate.Max)
		ok := true
		for i := 1; i < len(r.Feeds); i++ {
			gap := r.Feeds[i].At.Sub(r.Feeds[i-1].At).Minutes()
			if gap < gFeedInterval.Min || gap > gFeedInterval.Max {
				ok = false
				p.find("repletion-interval", LevelOutside, "repletion", SrcACSM,
					"Refuelling feeds %d and %d are %.0f min apart, outside every %g–%g min.", i-1, i, gap, gFeedInterval.Min, gFeedInterval.Max)
			}
		}
		if ok {
			p.find("repletion-interval", LevelOK, "repletion", SrcACSM,
				"%d refuelling feeds, every %g–%g min.", len(r.Feeds), gFeedInterval.Min, gFeedInterval.Max)
		}
		if len(r.Feeds) > 0 {
			pg := r.Feeds[0].ProteinG
			lvl := LevelOK
			if pg < math.Floor(gRepletionProt.Min*mass*0.8) {
				lvl = LevelNote
			}
			p.find("repletion-protein", lvl, "repletion", SrcACSM,
				"The first refuelling feed carries %g g protein (about %g g/kg is advised after key sessions).", pg, gRepletionProt.Min)
			if r.Feeds[0].At.After(p.req.SessionEnd.Add(time.Duration(gRefuelStart.Min * float64(time.Minute)))) {
				p.find("repletion-delay", LevelCaution, "repletion", SrcIvy,
					"The first refuelling feed comes %.0f min after the session; waiting 2 h roughly halves the early resynthesis rate.",
					r.Feeds[0].At.Sub(*p.req.SessionEnd).Minutes())
			} else {
				p.find("repletion-delay", LevelOK, "repletion", SrcIvy,
					"Refuelling starts at once; waiting 2 h would roughly halve the early resynthesis rate.")
			}
		}
		p.find("repletion-protein-option", LevelNote, "repletion", SrcVanLoon,
			"Where less carbohydrate is wanted, about 0.8 g/kg/h with 0.4 g/kg/h protein restores glycogen about as well as 1.2 g/kg/h carbohydrate alone.")
	}
	p.find("repletion-glycogen", LevelNote, "repletion", SrcJentjens,
		"Working-muscle glycogen is expected to rise from about %g g after the session to %g g at the next start (all muscle %g g of about %g g when full); synthesis is at most about %g–%g mmol/kg/h.",
		r.WorkingMuscleGAtEnd, r.WorkingMuscleGAtNextStart, r.MuscleGAtNextStart, r.MuscleGCapacity, gResynthMax.Min, gResynthMax.Max)
}

// checkBodyFat says, for very low or very high measured body fat, that
// g/kg of total body mass misleads, and gives the fat-free-mass basis.
func (p *planner) checkBodyFat() {
	bf := p.req.Athlete.BodyFatPct
	if bf == nil || p.body.FFMKg <= 0 {
		return
	}
	lim := gFatExtremeF
	if p.body.Sex == "male" {
		lim = gFatExtremeM
	}
	share := *bf / 100
	if share >= lim.Min && share <= lim.Max {
		return
	}
	word := "very low"
	if share > lim.Max {
		word = "very high"
	}
	p.find("body-fat-extreme", LevelNote, "plan", SrcSedlock,
		"Body fat of %g%% is %s (outside %.0f–%.0f%%): g/kg of total body mass misleads here. On fat-free mass (%.1M) the loading guide of %g g/kg lean mass is %.0f g a day; this plan's muscle and liver stores follow fat-free mass.",
		*bf, word, lim.Min*100, lim.Max*100, MassFigure{Kg: p.body.FFMKg}, gWomenFFM.Min, gWomenFFM.Min*p.body.FFMKg)
}

// screenEnergyAvailability screens a day's energy availability when
// fat-free mass is unknown, on an estimate at the reference body fat
// (model.reference-fat), and says it is an estimate: a day far short of
// its training must not pass on its carbohydrate band alone (IOC).
func (p *planner) screenEnergyAvailability(d *Day, subj string) {
	refFat := gRefFat.Min
	if p.body.Sex == "male" {
		refFat = gRefFat.Max
	}
	ffm := p.body.MassKg * (1 - refFat)
	ea := round1((d.EnergyKcal - *d.ExerciseEnergyKcal) / ffm)
	lvl := LevelNote
	switch {
	case ea >= gEAAdequate.Min:
		return
	case ea < gEALow.Min && d.Role != RoleEvent:
		lvl = LevelCaution
	}
	word := "between low (%g) and adequate (about %g)"
	if ea < gEALow.Min {
		word = "low (under %g; adequate is about %g)"
	}
	p.find("energy-availability-estimated", lvl, subj, SrcIOC,
		"Fat-free mass is unknown; estimated at %.1M (%.0f%% body fat assumed), energy availability is about %g kcal/kg FFM/day, "+word+
			": %g kcal eaten, %g kcal of exercise. Measure body fat to compute it.",
		MassFigure{Kg: ffm}, refFat*100, ea, gEALow.Min, gEAAdequate.Min, d.EnergyKcal, *d.ExerciseEnergyKcal)
}
