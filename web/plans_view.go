package web

import (
	_ "embed"

	"larder/internal/mass"

	"larder/internal/forms"
)

// PlanCSS is the stylesheet of the plan and foods pages, served at /assets/plans.css.
//
//go:embed plans.css
var PlanCSS []byte

// PlanJS is the new-plan form's small progressive enhancement, served at /assets/plans.js.
//
//go:embed plans.js
var PlanJS []byte

// FindingView is one finding ready to print. Its level is told by the word
// and the symbol (a shape) as well as the colour of its class.
type FindingView struct {
	Level   string // ok | note | caution | outside
	Symbol  string
	Word    string
	Message string
	Source  string
	Code    string
}

// LevelSymbol and LevelWord name a finding level for display.
func LevelSymbol(level string) string {
	switch level {
	case "ok":
		return "✓"
	case "note":
		return "◆"
	case "caution":
		return "▲"
	case "outside":
		return "✖"
	}
	return "•"
}

// LevelWord is the word shown with a finding's symbol.
func LevelWord(level string) string {
	switch level {
	case "ok":
		return "Within guideline"
	case "note":
		return "Note"
	case "caution":
		return "Caution"
	case "outside":
		return "Outside guideline"
	}
	return level
}

// countOK counts the findings within their guideline.
func countOK(fs []FindingView) int {
	n := 0
	for _, f := range fs {
		if f.Level == "ok" {
			n++
		}
	}
	return n
}

// FeedView is one feed of a day (or of the repletion window).
type FeedView struct {
	TimeName, ChoName string // form input names of its overrides
	Time              string // "07:00" in the plan's zone
	Label             string
	ChoG, ProteinG    string
	Overridden        bool
	Suggestion        string
	// Key names the feed's stored food plan (menu.FeedKey), so that a
	// test can read one feed's row on every surface.
	Key string
	// FoodURL opens the page where the dietitian decides the feed's food
	// (drafts only).
	FoodURL  string
	Findings []FindingView
}

// DayView is one row of the day-by-day table with its feeds.
type DayView struct {
	Date, DateLabel    string
	Role               string
	Training           string
	LoadBand           string
	Band               string // "10–12 g/kg"
	GPerKg             string
	ChoG               string
	ProteinG           string
	FatG               string
	EnergyKcal         string
	Occasions          string // number of feeds
	GPerKgName         string // form input names
	OccasionsName      string
	Overridden         bool
	LowFibre           bool
	Advice             []string
	Feeds              []FeedView
	Findings           []FindingView
	EnergyAvailability string
}

// Fact is a labelled figure with its findings (pre-event meal, in-event g/h ...).
type Fact struct {
	Label      string
	Value      string
	Hint       string
	Overridden bool
	// FoodURL: the link to decide the food of the feed the box is about.
	FoodURL  string
	Findings []FindingView
}

// VersionView is one row of the version history.
type VersionView struct {
	Number      int
	Status      string
	CreatedBy   string
	CreatedAt   string
	PublishedAt string
	Current     bool
	URL         string
}

// PlanView is everything the plan page prints; every number arrives formatted.
type PlanView struct {
	ClientID       int64
	ClientName     string
	ClientCautions string
	PlanID         int64
	Title          string
	KindLabel      string
	Protocol       string
	EventLabel     string
	TimeZone       string
	Version        int
	Status         string
	Revision       int
	Editable       bool // a draft: overrides may be changed and saved
	Revisable      bool // a published version with no draft yet
	DraftURL       string
	ActionURL      string
	ReviseURL      string
	DiscardURL     string

	BodyMass        string
	MassName        string // form input names of the body figures on a draft
	MassUnitName    string
	MassUnit        mass.Unit // the unit the body mass input is in
	FatName         string
	BodyMassWarning string
	FatFreeMass     string
	Caution         string

	PlanFindings   []FindingView
	Days           []DayView
	PreEvent       *Fact
	During         *Fact
	Race           RaceParts // legs, stages, hour blocks, caffeine
	DuringName     string    // form input name of the in-event g/h override
	DuringSugg     string
	Glycogen       []Fact
	Repletion      *Fact
	RepletionFeeds []FeedView
	MassGain       string

	GPerKgChart   []byte // SVG
	GlycogenChart []byte

	// Detail, when set, is PlanDetail already rendered for this view; the
	// fields only PlanDetail reads (Days, charts, race day, repletion,
	// feeds) may then be left empty.
	Detail []byte

	Versions []VersionView

	Carry     []Carried         // values typed for a version that can no longer change
	Theirs    map[string]string // after a refused save: the saved value of each input where it differs from the one typed
	Form      forms.Form        // override inputs: what the user typed, and errors
	Notice    string            // e.g. the concurrent-edit message
	Tolerance string            // the food suggestions' tolerance, in words
	// ProteinTolerance is the suggestions' margin on a feed's protein, in
	// words; ProteinFrom the smallest protein target held to it.
	ProteinTolerance string
	ProteinFrom      string
	SuggestionNote   string // e.g. that suggestions are gluten-free for a recorded caution

	// SetAside lists the dietitian's food choices kept with the version
	// for feeds it no longer has; SetAsideURL removes them (a draft only).
	SetAside    []SetAsideChoice
	SetAsideURL string
}

// SetAsideChoice is a food choice whose feed went with a change of the plan:
// Key names the feed as the choice does, Feed in words, Text the lines.
type SetAsideChoice struct{ Key, Feed, Text string }

// Carried is one value a person typed for a version that could not take it.
type Carried struct{ Name, Label, Value string }
