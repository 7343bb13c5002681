package web

// RaceParts is what a plan shows of an event's legs, stages, hour blocks
// and caffeine; each row is ready to print.
type RaceParts struct {
	Caffeine *Fact
	Segments []SegmentRow
	Stages   []StageRow
	Blocks   []BlockRow
	// StageFindings are the findings of the stages, in stage order.
	StageFindings []FindingView
}

// SegmentRow is one leg of a multi-sport event.
type SegmentRow struct {
	Leg, Activity, Distance, Duration, Energy, Share, Muscle, GPerH, RunsOut string
	Findings                                                                 []FindingView
}

// StageRow is one stage of a stage race.
type StageRow struct {
	Number, Start, Activity, Duration, PreMeal string
	// GPerH is the in-stage g/h; GPerHName the name of its override input.
	GPerH, GPerHName string
	Overridden       bool
	StartDensity     string
	RunsOut          string
	Refuel           string
	Findings         []FindingView
}

// BlockRow is one block of hours of an event over a day.
type BlockRow struct {
	From, To, GPerH, ChoG string
	Night                 bool
}
