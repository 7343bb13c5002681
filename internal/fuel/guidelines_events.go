package fuel

// Sources of the event rows, spelled as REFERENCES.md cites them. The
// diabetes consensus statements are not yet in REFERENCES.md; they are
// written down from memory and say so.
const (
	SrcKimber   = "Kimber NE et al. Int J Sport Nutr Exerc Metab 2002;12(1):47–62"
	SrcCuddy    = "Cuddy JS et al. Int J Sports Physiol Perform 2010;5(4):570 (first page)"
	SrcMaughan  = "Maughan RJ et al. IOC consensus statement: dietary supplements and the high-performance athlete. Br J Sports Med 2018;52:439–455 (table of supplements with good evidence)"
	SrcPedersen = "Pedersen DJ et al. J Appl Physiol 2008;105:7–13"
	SrcDiabetes = "Riddell MC et al. Exercise management in type 1 diabetes: a consensus statement. Lancet Diabetes Endocrinol 2017;5(5):377–390; Colberg SR et al. Physical activity/exercise and diabetes: a position statement of the American Diabetes Association. Diabetes Care 2016;39(11):2065–2079 (from memory)"
)

// Guidelines is THE one table of values the engine uses, each with its
// source: the core rows and those of multi-sport events, stage races,
// long events and sessions, caffeine and diabetes.
var Guidelines = append(append([]Guideline{}, coreGuidelines...), eventGuidelines...)

var eventGuidelines = []Guideline{
	// Multi-sport events.
	{"swim.vo2.speed", "swimming oxygen uptake VO2 (L/min) = 3.65·v + 0.02·W − 2.545: speed term (v in m/s)", 3.65, 3.65, "L/min per m/s", SrcKimber},
	{"swim.vo2.mass", "swimming oxygen uptake: body-mass term (W in kg)", 0.02, 0.02, "L/min per kg", SrcKimber},
	{"swim.vo2.const", "swimming oxygen uptake: constant (subtracted)", 2.545, 2.545, "L/min", SrcKimber},
	{"ironman.energy.men", "Ironman (3.8 km swim, 180 km cycle, 42.2 km run) energy expenditure, men: 10,036 ± 931 kcal (mean ± SD)", 10036 - 931, 10036 + 931, "kcal", SrcKimber},
	{"ironman.energy.women", "Ironman energy expenditure, women: 8,570 ± 1,014 kcal (mean ± SD)", 8570 - 1014, 8570 + 1014, "kcal", SrcKimber},
	{"ironman.energy.cuddy", "Ironman, one finisher in 10 h 40 min: 8,926 kcal (doubly labelled water) and 9,029 kcal (calorimetry)", 8926, 9029, "kcal", SrcCuddy},
	{"model.swim-muscle", "a swim draws its muscle glycogen from the arms and trunk (the muscle other than the legs); the legs rest for the cycle and run", 1, 1, "flag", SrcModel},
	{"model.transition-intensity", "a transition between legs is easy effort (the other-exercise METs at 50% VO2max)", 50, 50, "% VO2max", SrcModel},

	// Long events and stage races.
	{"ultra.block", "in-event plan of an event over 24 h shown in blocks of this many hours", 4, 4, "h", SrcModel},
	{"ultra.night", "night hours of an event (22:00 to 06:00): sleepiness and a smaller appetite; feeds planned as in daytime, warm and easily digested where possible", 22, 6, "h (clock)", SrcCommon},
	{"ultra.event-min", "an event longer than this carries the in-event plan through the night, with no ordinary meal day inside it", 1440, 1440, "min", SrcCommon},
	{"stage.count", "a stage race has 2 to 21 stages", 2, 21, "stages", SrcCommon},

	// Long training sessions.
	{"session.long-min", "a session this long or longer gets a pre-session meal and in-session carbohydrate", 90, 90, "min", SrcACSM},
	{"session.pre-meal", "pre-session meal before a long session: 1 g/kg about 2 h before (inside 1–4 g/kg, 1–4 h)", 1, 2, "g/kg; h", SrcModel},
	{"session.low-liver", "a session leaves the liver low when its glycogen falls under this share of capacity", 0.2, 0.2, "share of liver capacity", SrcModel},

	// Pre-event meal and the meals after the event.
	{"event.meal-after-min", "each main meal after the finish carries at least this much carbohydrate (snacks half), even when the event's feeds fill the day's band", 0.5, 0.5, "g/kg", SrcModel},
	{"pre-event.protein-max", "protein in the pre-event meal: at most about 0.3 g/kg, with little fat and fibre", 0.3, 0.3, "g/kg", SrcACSM},

	// Caffeine.
	{"caffeine.pre-event", "caffeine before exercise: 3–6 mg/kg", 3, 6, "mg/kg", SrcMaughan},
	{"caffeine.pre-event-min", "caffeine about 60 min before the start", 60, 60, "min", SrcMaughan},
	{"caffeine.no-benefit", "9 mg/kg or more adds no benefit and raises side effects", 9, 9, "mg/kg", SrcMaughan},
	{"caffeine.long-event", "an event longer than this gets the note on lower caffeine doses later in the race", 4, 4, "h", SrcModel},
	{"caffeine.repletion", "8 mg/kg caffeine with carbohydrate after exhausting exercise raised the 4-h glycogen resynthesis rate by 66% (38.0 vs 57.7 mmol/kg dw/h)", 8, 1.66, "mg/kg; ratio", SrcPedersen},
}

// Guideline values of the event rows as used in the code.
var (
	gSwimV       = guideline("swim.vo2.speed")
	gSwimW       = guideline("swim.vo2.mass")
	gSwimC       = guideline("swim.vo2.const")
	gIronMen     = guideline("ironman.energy.men")
	gIronWomen   = guideline("ironman.energy.women")
	gIronCuddy   = guideline("ironman.energy.cuddy")
	gTransPct    = guideline("model.transition-intensity")
	gUltraBlock  = guideline("ultra.block")
	gUltraNight  = guideline("ultra.night")
	gUltraMin    = guideline("ultra.event-min")
	gStageCount  = guideline("stage.count")
	gLongSession = guideline("session.long-min")
	gSessionPre  = guideline("session.pre-meal")
	gSessionLow  = guideline("session.low-liver")
	gPreProtMax  = guideline("pre-event.protein-max")
	gMealAfter   = guideline("event.meal-after-min")
	gCafPre      = guideline("caffeine.pre-event")
	gCafPreMin   = guideline("caffeine.pre-event-min")
	gCafNoGain   = guideline("caffeine.no-benefit")
	gCafRep      = guideline("caffeine.repletion")
	gCafLong     = guideline("caffeine.long-event")
)
