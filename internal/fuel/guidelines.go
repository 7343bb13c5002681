package fuel

// Guideline is one published (or trade) value the engine uses. Min and Max
// hold a range; a single value has Min == Max.
type Guideline struct {
	Key         string  `json:"key"`
	Description string  `json:"description"`
	Min         float64 `json:"min"`
	Max         float64 `json:"max"`
	Unit        string  `json:"unit"`
	Source      string  `json:"source"` // exactly as REFERENCES.md "cite as"
}

// Sources, spelled exactly as /work/shared/REFERENCES.md cites them.
const (
	SrcBands         = "ACSM/AND/DC 2016 joint position statement; Burke et al. 2011"
	SrcACSM          = "ACSM/AND/DC 2016"
	SrcACSMJeuk      = "ACSM/AND/DC 2016; Jeukendrup AE. Sports Med 2014;44 Suppl 1:S25–S33"
	SrcSedlock       = "Sedlock DA. The latest on carbohydrate loading. Curr Sports Med Rep 2008;7(4):209–213"
	SrcBussau        = "Bussau VA et al. Eur J Appl Physiol 2002;87:290–295 (from memory)"
	SrcVanLoon       = "van Loon LJ et al. Am J Clin Nutr 2000;72:106–111 (from memory)"
	SrcIvy           = "Ivy JL et al. J Appl Physiol 1988;64:1480–1485 (from memory)"
	SrcIvy2004       = "Ivy JL. J Sports Sci Med 2004;3:131–138 (review)"
	SrcIOC           = "IOC consensus statement on REDs (Mountjoy M et al. Br J Sports Med 2018;52:687–697; 2023 update)"
	SrcIUPAC         = "IUPAC standard atomic weights"
	SrcCommon        = "common practice"
	SrcOlsson        = "Olsson KE, Saltin B. Acta Physiol Scand 1970;80:11–18 (from memory)"
	SrcDensity       = "Bergström J et al. Acta Physiol Scand 1967;71:140–150; Sherman WM et al. Int J Sports Med 1981;2:114–118 (from memory)"
	SrcJentjens      = "Jentjens R, Jeukendrup AE. Sports Med 2003;33(2):117–144 (from memory)"
	SrcJanssen       = "Janssen I et al. J Appl Physiol 2000;89:81–88"
	SrcRapoport      = "Rapoport BI. PLoS Comput Biol 2010;6(10):e1000960"
	SrcRapoportShort = "Rapoport 2010"
	SrcRapoportCP    = "Rapoport 2010; common practice"
	SrcBoer          = "Boer P. Estimated lean body mass as an index for normalization of body fluid volumes in humans. Am J Physiol 1984;247:F632–F636"
	SrcWeir          = "Weir JB. J Physiol 1949;109:1–9"
	SrcFrayn         = "Frayn KN. J Appl Physiol 1983;55:628–634"
	SrcRomijn        = "Romijn JA et al. Am J Physiol 1993;265:E380–E391 (from memory, shape only)"
	SrcAtwater       = "Atwater general factors (FAO 2003 food energy report)"
	SrcAinsworth     = "Ainsworth BE et al. 2011 Compendium of Physical Activities, Med Sci Sports Exerc 2011;43:1575–1581"
	// SrcModel marks a modelling choice of this engine that no reference
	// fixes; it is documented where it is used.
	SrcModel = "model assumption"
)

// coreGuidelines is the main part of Guidelines, the one table of values the engine uses, each with its source.
// Code reads it through the named variables below, so a value lives here only.
var coreGuidelines = []Guideline{
	// Daily carbohydrate by training load.
	{"band.light", "light: low-intensity or skill-based activity", 3, 5, "g/kg/day", SrcBands},
	{"band.moderate", "moderate: moderate exercise about 1 h a day", 5, 7, "g/kg/day", SrcBands},
	{"band.high", "high: endurance, 1–3 h a day of moderate to high intensity", 6, 10, "g/kg/day", SrcBands},
	{"band.very-high", "very high: extreme commitment, over 4–5 h a day", 8, 12, "g/kg/day", SrcBands},

	// Acute fuelling.
	{"fuelling-up", "general fuelling up, events under 90 min", 7, 12, "g/kg per 24 h", SrcACSM},
	{"loading.event-min", "carbohydrate loading is for events over 90 min", 90, 90, "min", SrcACSM},
	{"loading.two-day", "carbohydrate loading, events over 90 min, for 36–48 h", 10, 12, "g/kg per 24 h", SrcACSM},
	{"loading.women-bm", "women loading: over 8 g/kg body mass per day", 8, 8, "g/kg/day", SrcSedlock},
	{"loading.women-ffm", "women loading: or 10 g/kg lean mass per day", 10, 10, "g/kg FFM/day", SrcSedlock},
	{"loading.one-day", "one-day loading: about 10 g/kg in 24 h with rest", 10, 10, "g/kg per 24 h", SrcBussau},
	{"model.short-bout", "a short intense bout before one-day loading: at most 15 min (Max) at 85% VO2max or more (Min)", 85, 15, "% VO2max; min", SrcModel},
	{"repletion.speedy-gap", "speedy refuelling applies when under 8 h separate two demanding sessions", 8, 8, "h", SrcACSM},
	{"repletion.rate", "speedy refuelling: 1.0–1.2 g/kg/h for the first 4 h, then daily needs", 1.0, 1.2, "g/kg/h", SrcACSM},
	{"repletion.window", "speedy refuelling window", 4, 4, "h", SrcACSM},
	{"repletion.feed-interval", "feeds every 15–60 min during speedy refuelling", 15, 60, "min", SrcACSM},
	{"repletion.protein", "protein after key sessions: about 0.3 g/kg", 0.3, 0.3, "g/kg", SrcACSM},
	{"repletion.cho-protein", "0.8 g/kg/h carbohydrate + 0.4 g/kg/h protein ≈ 1.2 g/kg/h carbohydrate alone for glycogen", 0.8, 1.2, "g/kg/h", SrcVanLoon},
	{"repletion.delay-2h", "waiting 2 h after exercise roughly halves the early resynthesis rate", 0.5, 0.5, "ratio", SrcIvy},
	{"pre-event.cho", "pre-event meal before exercise over 60 min: 1–4 g/kg", 1, 4, "g/kg", SrcACSM},
	{"pre-event.hours", "pre-event meal 1–4 h before", 1, 4, "h", SrcACSM},
	{"pre-event.event-min", "the pre-event meal guideline is for exercise over 60 min", 60, 60, "min", SrcACSM},
	{"during.none", "during exercise under 45 min: not needed", 0, 45, "min", SrcACSM},
	{"during.small", "during 45–75 min: small amounts or mouth rinse", 45, 75, "min", SrcACSM},
	{"during.small-rate", "small amounts during 45–75 min (this engine's ceiling for 'small')", 0, 30, "g/h", SrcACSM},
	{"during.30-60", "during 1–2.5 h: 30–60 g/h", 30, 60, "g/h", SrcACSMJeuk},
	{"during.30-60-time", "the 30–60 g/h band applies up to 2.5 h", 75, 150, "min", SrcACSMJeuk},
	{"during.up-to-90", "during over 2.5–3 h: up to 90 g/h, from multiple transportable carbohydrates", 30, 90, "g/h", SrcACSMJeuk},
	{"during.hard-cover", "above roughly 80% of maximum heart rate, the highest practical intake covers only about a third (≈35%) of carbohydrate use", 0.35, 0.35, "share", SrcCommon},
	{"protein.daily", "protein, daily", 1.2, 2.0, "g/kg/day", SrcACSM},
	{"protein.meal", "protein about 0.3 g/kg per meal, every 3–5 h", 0.3, 0.3, "g/kg", SrcACSM},
	{"fat.floor", "fat not below 20% of energy", 0.20, 0.20, "share of energy", SrcACSM},

	// Energy availability.
	{"ea.low", "low energy availability: under 30 kcal/kg FFM/day", 30, 30, "kcal/kg FFM/day", SrcIOC},
	{"ea.adequate", "adequate energy availability: about 45 kcal/kg FFM/day", 45, 45, "kcal/kg FFM/day", SrcIOC},

	// Body, glycogen and energy.
	{"glucosyl.g-per-mmol", "glucosyl unit C6H10O5, 162.14 g/mol", 0.162, 0.162, "g/mmol", SrcIUPAC},
	{"liver.fed-70kg", "liver glycogen, fed 70 kg adult", 100, 120, "g", SrcCommon},
	{"muscle.70kg", "muscle glycogen, 70 kg adult", 400, 400, "g", SrcCommon},
	{"liver.fed-hours", "liver glycogen is the main source of blood glucose after a meal for about 8–12 h", 8, 12, "h", SrcCommon},
	{"glycogen.water", "water stored with glycogen: about 3 g per g (3–4 parts)", 3, 4, "g/g", SrcOlsson},
	{"density.depleted", "muscle glycogen density, depleted", 25, 40, "mmol/kg wet muscle", SrcDensity},
	{"density.typical", "muscle glycogen density, typical trained", 80, 120, "mmol/kg wet muscle", SrcDensity},
	{"density.loaded", "muscle glycogen density, after loading (150–200+)", 150, 200, "mmol/kg wet muscle", SrcDensity},
	{"resynthesis.max", "maximal muscle resynthesis with ample carbohydrate in the first hours", 5, 8, "mmol/kg wet muscle/h", SrcJentjens},
	{"muscle.share.male", "skeletal muscle mass / body mass, men", 0.384, 0.384, "share", SrcJanssen},
	{"muscle.share.female", "skeletal muscle mass / body mass, women", 0.306, 0.306, "share", SrcJanssen},
	{"legs.share.male", "leg muscle / body mass, men (range about 14–27%)", 0.21, 0.21, "share", SrcRapoport},
	{"legs.share.female", "leg muscle / body mass, women (range about 14–27%)", 0.20, 0.20, "share", SrcRapoport},
	{"legs.loaded-kcal", "supercompensated leg glycogen", 144, 144, "kcal/kg leg muscle", SrcRapoportShort},
	{"run.kcal-per-kg-km", "energy cost of running", 1, 1, "kcal/kg/km", SrcRapoportCP},
	{"cycle.kj-per-kcal", "1 kJ of mechanical work ≈ 1 kcal expended (gross efficiency ≈ 24%)", 0.24, 0.24, "efficiency", SrcCommon},
	{"boer.male", "lean body mass, men: 0.407·W + 0.267·H − 19.2", 0, 0, "kg", SrcBoer},
	{"boer.female", "lean body mass, women: 0.252·W + 0.473·H − 48.3", 0, 0, "kg", SrcBoer},
	{"weir", "kcal = 3.941·VO2 + 1.106·VCO2 (litres)", 3.941, 1.106, "kcal/L", SrcWeir},
	{"frayn.cho", "carbohydrate g/min = 4.55·VCO2 − 3.21·VO2", 4.55, 3.21, "g/L", SrcFrayn},
	{"frayn.fat", "fat g/min = 1.67·VO2 − 1.67·VCO2", 1.67, 1.67, "g/L", SrcFrayn},
	{"share.25", "carbohydrate share of energy (Max) at ≈ 25% VO2max (Min): small", 25, 0.10, "% VO2max; share", SrcRomijn},
	{"share.65", "carbohydrate share of energy (Max) at ≈ 65% VO2max (Min): about half", 65, 0.50, "% VO2max; share", SrcRomijn},
	{"share.85", "carbohydrate share of energy (Max) at ≈ 85% VO2max (Min): about three quarters", 85, 0.75, "% VO2max; share", SrcRomijn},
	{"atwater.cho", "carbohydrate energy", 4, 4, "kcal/g", SrcAtwater},
	{"atwater.protein", "protein energy", 4, 4, "kcal/g", SrcAtwater},
	{"atwater.fat", "fat energy", 9, 9, "kcal/g", SrcAtwater},
	{"atwater.alcohol", "alcohol energy", 7, 7, "kcal/g", SrcAtwater},
	{"kj-per-kcal", "1 kcal = 4.184 kJ", 4.184, 4.184, "kJ/kcal", SrcAtwater},
	{"met", "1 MET ≈ 1 kcal/kg/h ≈ 3.5 ml O2/kg/min", 1, 3.5, "kcal/kg/h; ml/kg/min", SrcAinsworth},
	// MET values for sessions (Min = easy, Max = hard, moderate = midpoint);
	// the activity values are from memory of the Compendium, not copied.
	{"met.run", "running, easy to hard (activity values from memory)", 7, 12.5, "MET", SrcAinsworth},
	{"met.cycle", "cycling, easy to hard (activity values from memory)", 6.8, 10, "MET", SrcAinsworth},
	{"met.swim", "swimming, easy to hard (activity values from memory)", 6, 10, "MET", SrcAinsworth},
	{"met.row", "rowing, easy to hard (activity values from memory)", 4.8, 12, "MET", SrcAinsworth},
	{"met.ski", "cross-country skiing, easy to hard (activity values from memory)", 6.8, 12.5, "MET", SrcAinsworth},
	{"met.triathlon", "triathlon training, easy to hard (activity values from memory)", 7, 12, "MET", SrcAinsworth},
	{"met.team", "team sport, easy to hard (activity values from memory)", 6, 10, "MET", SrcAinsworth},
	{"met.strength", "resistance training, easy to hard (activity values from memory)", 3.5, 6, "MET", SrcAinsworth},
	{"met.other", "other exercise, easy to hard (activity values from memory)", 5, 9, "MET", SrcAinsworth},
	{"marathon.wall", "a typical runner at marathon pace with usual stores runs low at roughly 30–35 km", 30, 35, "km", SrcRapoportCP},

	// Model choices (no single reference; see model.go).
	{"model.typical-density", "starting muscle glycogen density when nothing else is known (middle of the typical band)", 100, 100, "mmol/kg wet muscle", SrcModel},
	{"model.capacity-density", "asymptote of muscle glycogen density the synthesis model approaches (loaded band's '200+')", 220, 220, "mmol/kg wet muscle", SrcModel},
	{"model.reference-fat", "body fat of the reference bodies the per-kg muscle, leg and liver shares describe (women Min, men Max): with body fat measured, the shares apply to a body of the same fat-free mass at this fat", 0.25, 0.15, "share of body mass", SrcModel},
	{"model.body-fat-extreme", "body fat outside which g/kg of total body mass misleads and a finding gives the fat-free-mass basis, women", 0.15, 0.35, "share of body mass (women)", SrcModel},
	{"model.body-fat-extreme-men", "the same bounds for men", 0.08, 0.25, "share of body mass", SrcModel},
	{"model.liver-per-kg", "liver glycogen capacity per kg body mass (gives 112 g at 70 kg, inside 100–120 g)", 1.6, 1.6, "g/kg", SrcModel},
	{"model.gut-absorption", "the gut delivers eaten carbohydrate first-order with a 1.5 h time constant (86% of a meal within 3 h, 93% within 4 h: the 1–4 h pre-event meal timing), at most at the exogenous oxidation ceiling of multiple transportable carbohydrate, 1.75 g/min (Jeukendrup 2014; mixed meals hold glucose and fructose sources)", 105, 1.5, "g/h; h", SrcModel},
	{"model.window-boost", "rapid phase of the post-exercise window of synthesis: the rested rate is this share (Min) of the rate just after exercise, the rest decaying with a time constant (Max), so that feeding 2 h late lowers synthesis over the first 2 h of feeding by about 40% (ratio 0.62; Ivy 1988 measured roughly a half)", 0.35, 1.5, "share; h", SrcModel},
	{"model.window-slow", "slow phase of the post-exercise window: the raised synthesis of the muscle that worked (and, after a near-maximal bout, of the extra fibres it recruited) fades with this time constant to the resting synthesis of all muscle (Jentjens & Jeukendrup 2003, from memory: raised insulin sensitivity after exercise lasts many hours, up to about 48 h)", 24, 24, "h", SrcModel},
	{"model.fibre-recruitment", "exercise at or above Min %VO2max (near-maximal) recruits all fibre types of the working muscle; below it mainly the type I fibres, about this share (Max) of the fibres (vastus lateralis about half type I, from memory), so after a near-maximal bout 1/Max times the fibres synthesise at the rested rate, the extra fading in the slow phase (Fairchild 2002: glycogen rose alike in type I, IIa and IIb fibres after a near-maximal bout)", 85, 0.5, "% VO2max; share of fibres", SrcModel},
	{"model.synthesis-supply", "synthesis rises with the carbohydrate absorbed as x/(x+K), K in g per kg body mass per h: more at 1.2 than at 0.8 g/kg/h, levelling off above (Ivy 2004 review: about 1.2 g/kg/h maximises)", 0.4, 0.4, "g/kg/h", SrcModel},
	{"model.working.swim", "working muscle share of skeletal muscle, swimming", 0.70, 0.70, "share", SrcModel},
	{"model.working.row", "working muscle share of skeletal muscle, rowing and cross-country skiing", 0.85, 0.85, "share", SrcModel},
	{"model.working.triathlon", "working muscle share of skeletal muscle, triathlon", 0.75, 0.75, "share", SrcModel},
	{"model.rest-synthesis", "resting synthesis, in all muscle whether it worked or not: at most this share (Min) of the rate just after exercise, slowing as the power (Max) of the room left below the level recent intake sets (model.rest-level); one day of about 10 g/kg at rest loads muscle (Bussau 2002, from memory)", 0.5, 1, "share; exponent", SrcModel},
	{"model.rest-level", "resting muscle glycogen settles at the typical density times recent carbohydrate intake over resting use (model.rest-cho-ox): no carbohydrate leaves it depleted, a mixed diet typical, a high one loaded (Bergström 1967, from memory); intake averaged with this time constant (Max)", 1, 24, "ratio; h", SrcModel},
	{"liver.overnight-fall", "a 10–12 h overnight fast typically lowers liver glycogen by roughly a third to a half (the model's fasting liver gives up half its capacity over the 8 h after the evening meal is absorbed, gluconeogenesis supplying the rest of its glucose output)", 1.0 / 3, 0.5, "share of fed liver glycogen", SrcCommon},
	{"liver.overnight-hours", "the overnight fast of that fall", 10, 12, "h", SrcCommon},
	{"model.liver-floor", "below a fifth of its capacity the liver gives up glycogen ever more slowly, in proportion to what is left, so it does not run dry in ordinary exercise", 0.2, 0.2, "share of liver capacity", SrcModel},
	{"model.gluconeogenesis", "glucose the liver makes from lactate, glycerol and amino acids during exercise, sparing its glycogen", 0.1, 0.1, "g/kg/h", SrcModel},
	{"model.daily-muscle", "share of uncovered resting and daily-living carbohydrate use drawn from muscle glycogen (the rest from fat)", 0.3, 0.3, "share", SrcModel},
	{"model.liver-share", "share of absorbed carbohydrate the liver takes on first pass, before resting use and muscle synthesis", 0.3, 0.3, "share", SrcModel},
	{"fat.upper", "fat share of energy used at most when filling an energy target", 0.35, 0.35, "share of energy", SrcCommon},
	{"fat.upper-event", "fat share of energy used at most on the event day itself: carbohydrate gets the room and fat is kept moderate around racing", 0.25, 0.25, "share of energy", SrcCommon},
	{"model.rest-cho-ox", "resting and daily-living carbohydrate use at typical stores, scaled in proportion to stores / typical so intake sets the level stores settle at", 0.17, 0.17, "g/kg/h", SrcModel},
	{"model.resynthesis-peak", "synthesis rate of empty muscle just after exercise with unlimited glucose supply, calibrated on the 4-h studies; with the window and supply terms it gives rates inside the 5–8 (Jentjens & Jeukendrup, from memory) and 8–10 wet (Flynn 2020, Wallis 2008, Pedersen 2008) ranges, and the one-day load of Fairchild 2002", 24, 24, "mmol/kg wet muscle/h", SrcModel},
	{"model.cover-easy", "share of carbohydrate use intake can cover at easy efforts (40% VO2max and below); falls to 0.35 at 67% VO2max (≈80% of maximum heart rate)", 0.6, 0.6, "share", SrcModel},
	{"during.long-floor", "over 2.5 h, the usual practical intake is 60–90 g/h", 60, 90, "g/h", SrcCommon},
	{"pre-event.earliest", "earliest practical time for a pre-event meal", 5, 5, "h (05:00)", SrcCommon},
	{"load.target.two-day", "target on two-day load days (inside 10–12)", 10.5, 10.5, "g/kg", SrcModel},
	{"load.target.other", "target on one-day and three-day load days", 10, 10, "g/kg", SrcModel},
	{"protein.target", "daily protein target (inside 1.2–2.0)", 1.6, 1.6, "g/kg/day", SrcModel},
	{"fat.share", "fat share of energy when no energy target is known: 25% on ordinary days, 22% on load days (both above the 20% floor)", 0.22, 0.25, "share of energy", SrcModel},
	{"recovery.feed", "recovery feed after an event or hard session", 1.0, 1.0, "g/kg", SrcCommon},
	// Thresholds of the pipeline, each where the code reads it.
	{"model.intensity-factor", "a session's effective minutes are its minutes × (%VO2max − Min) / Max: 1 at 65%, 0.5 at 50%, 1.5 at 80%", 35, 30, "% VO2max; % per unit", SrcModel},
	{"model.intensity-factor-clamp", "the intensity factor is held between these", 0.3, 2, "factor", SrcModel},
	{"model.load-band-minutes", "day's band by effective minutes: under Min light, under Max moderate, else high (about 1 h a day moderate is the moderate band)", 45, 90, "effective min", SrcModel},
	{"model.load-band-very-high", "the very high band: over Min training minutes (ACSM's 'over 4–5 h a day') or Max effective minutes and more", 240, 300, "min; effective min", SrcModel},
	{"model.cover-intensity", "intake covers the easy share of carbohydrate use at or below Min %VO2max and the hard share (about a third) at or above Max (≈80% of maximum heart rate), linearly between", 40, 67, "% VO2max", SrcModel},
	{"model.cho-share-clamp", "the carbohydrate share of energy is held between these", 0.05, 0.95, "share", SrcModel},
	{"rer.nonprotein", "non-protein RER of pure fat (Min) and pure carbohydrate (Max) oxidation, from the Frayn equations (fat g/min = 0 at RER 1; carbohydrate ≈ 0 at RER 0.7)", 0.7, 1.0, "RER", SrcFrayn},
	{"model.demanding-session", "a session is demanding at Min %VO2max or more (or by length, see model.demanding-session-min), and gets a recovery feed Max min after its end", 75, 30, "% VO2max; min after", SrcModel},
	{"model.demanding-session-min", "a session of this many minutes or more is demanding; no ordinary meal in the 2 h (Max) after its end", 90, 2, "min; h", SrcModel},
	{"pre-event.protein", "protein in the pre-event meal: half a usual meal's 0.3 g/kg, kept low so the meal empties from the stomach", 0.5, 0.5, "share of a meal's protein", SrcModel},
	{"repletion.feed-every", "speedy refuelling feeds every 30 min", 30, 30, "min", SrcIvy2004},
	{"model.meal-clear", "no ordinary meal from Min min before a pre-event or pre-session meal (or the start) to Min min after the recovery feed; an ordinary meal falling less than Max min before a session moves to its end", 90, 30, "min; min", SrcModel},
	{"model.start-since-exercise", "a simulation starts with the working muscle last exercised this many hours before (a trained athlete's usual day): the rapid window phase is closed", 24, 24, "h", SrcModel},
	{"protein.meal-interval", "protein and carbohydrate spread across the day, every 3–5 h", 3, 5, "h", SrcACSM},
	{"repletion.start-within", "refuelling starts at once after exercise: a first feed later than this after the session's end is flagged", 30, 30, "min", SrcIvy2004},
	{"model.next-start-clear", "no ordinary meal from Min h before the next start to Max h after its start", 1, 1.5, "h", SrcModel},
	{"model.taper-days", "days a loading plan covers before the event when none are given", 7, 7, "days", SrcModel},
	// Race intensity by duration when none is given: up to Min minutes, Max % VO2max.
	{"model.race-intensity.0", "race intensity when none is given, up to 15 min", 15, 95, "min; % VO2max", SrcModel},
	{"model.race-intensity.1", "race intensity when none is given, up to 45 min", 45, 90, "min; % VO2max", SrcModel},
	{"model.race-intensity.2", "race intensity when none is given, up to 90 min", 90, 85, "min; % VO2max", SrcModel},
	{"model.race-intensity.3", "race intensity when none is given, up to 3 h", 180, 80, "min; % VO2max", SrcModel},
	{"model.race-intensity.4", "race intensity when none is given, up to 5 h", 300, 72, "min; % VO2max", SrcModel},
	{"model.race-intensity.5", "race intensity when none is given, up to 10 h", 600, 65, "min; % VO2max", SrcModel},
	{"model.race-intensity.6", "race intensity when none is given, longer", 1e9, 55, "min; % VO2max", SrcModel},
	// The day-target line through effective training minutes (Min) and
	// g/kg/day (Max), kept inside the day's band afterwards.
	{"model.target-line.0", "day-target line: no training", 0, 3, "effective min; g/kg/day", SrcModel},
	{"model.target-line.1", "day-target line: 45 effective min", 45, 5, "effective min; g/kg/day", SrcModel},
	{"model.target-line.2", "day-target line: 90 effective min", 90, 6, "effective min; g/kg/day", SrcModel},
	{"model.target-line.3", "day-target line: 300 effective min", 300, 9, "effective min; g/kg/day", SrcModel},
	{"model.target-line.4", "day-target line: 480 effective min", 480, 12, "effective min; g/kg/day", SrcModel},
	{"model.intensity.easy", "a session logged as easy", 50, 50, "% VO2max", SrcModel},
	{"model.intensity.moderate", "a session logged as moderate (or without intensity)", 65, 65, "% VO2max", SrcModel},
	{"model.intensity.hard", "a session logged as hard", 80, 80, "% VO2max", SrcModel},
	{"model.intensity.rpe", "a session logged as rpe:N is at 40 + 5·N % VO2max", 40, 5, "% VO2max; per RPE point", SrcModel},
	{"model.session-start", "start of a session logged without a time", 16, 16, "h (16:00)", SrcModel},
	{"pre-event.default-hours", "pre-event meal time before the start, when the clock allows", 3, 3, "h", SrcModel},
	{"during.rate-step", "the in-event g/h is the least multiple of this step that keeps the stores from running out", 5, 5, "g/h", SrcModel},
	{"model.session-match", "a logged session is the one a repletion plan follows when it ends within this many minutes of the given session end", 15, 15, "min", SrcModel},
	{"model.rest-meal", "a day's remaining food, when no ordinary occasion fits, goes Min min after the event's finish that day (labelled dinner from Max o'clock, else lunch)", 90, 17, "min; h (clock)", SrcModel},
	{"model.rest-meal-lunch", "a day's remaining food, when no ordinary occasion fits and no finish leaves room, goes at lunch time", 12.5, 12.5, "h (12:30)", SrcModel},
	{"model.run-fraction", "share of a session's work drawn from the working muscle's glycogen vs. blood glucose from the liver", 0.8, 0.8, "share", SrcModel},
}

// guideline returns the entry for key; a missing key is a programming
// error caught by the first test run.
func guideline(key string) Guideline {
	for _, g := range Guidelines {
		if g.Key == key {
			return g
		}
	}
	panic("fuel: no guideline " + key)
}

// Guideline values as used in the code.
var (
	gBandLight    = guideline("band.light")
	gBandModerate = guideline("band.moderate")
	gBandHigh     = guideline("band.high")
	gBandVeryHigh = guideline("band.very-high")

	gFuellingUp     = guideline("fuelling-up")
	gLoadingEvent   = guideline("loading.event-min")
	gLoadingTwoDay  = guideline("loading.two-day")
	gWomenBM        = guideline("loading.women-bm")
	gWomenFFM       = guideline("loading.women-ffm")
	gLoadingOneDay  = guideline("loading.one-day")
	gShortBout      = guideline("model.short-bout")
	gSpeedyGap      = guideline("repletion.speedy-gap")
	gRepletionRate  = guideline("repletion.rate")
	gRepletionWin   = guideline("repletion.window")
	gFeedInterval   = guideline("repletion.feed-interval")
	gRepletionProt  = guideline("repletion.protein")
	gDelay2h        = guideline("repletion.delay-2h")
	gPreEventCho    = guideline("pre-event.cho")
	gPreEventHours  = guideline("pre-event.hours")
	gPreEventMin    = guideline("pre-event.event-min")
	gDuringNone     = guideline("during.none")
	gDuringSmall    = guideline("during.small")
	gDuringSmallG   = guideline("during.small-rate")
	gDuring3060     = guideline("during.30-60")
	gDuring3060Time = guideline("during.30-60-time")
	gDuringUpTo90   = guideline("during.up-to-90")
	gHardCover      = guideline("during.hard-cover")
	gProteinDaily   = guideline("protein.daily")
	gProteinMeal    = guideline("protein.meal")
	gFatFloor       = guideline("fat.floor")

	gEALow      = guideline("ea.low")
	gEAAdequate = guideline("ea.adequate")

	gGlucosyl      = guideline("glucosyl.g-per-mmol")
	gLiverFedHours = guideline("liver.fed-hours")
	gWater         = guideline("glycogen.water")
	gDepleted      = guideline("density.depleted")
	gTypical       = guideline("density.typical")
	gLoaded        = guideline("density.loaded")
	gResynthMax    = guideline("resynthesis.max")
	gMuscleMale    = guideline("muscle.share.male")
	gMuscleFemale  = guideline("muscle.share.female")
	gLegsMale      = guideline("legs.share.male")
	gLegsFemale    = guideline("legs.share.female")
	gRunCost       = guideline("run.kcal-per-kg-km")
	gCycleEff      = guideline("cycle.kj-per-kcal")
	gWeir          = guideline("weir")
	gFraynCho      = guideline("frayn.cho")
	gFraynFat      = guideline("frayn.fat")
	gShare25       = guideline("share.25")
	gShare65       = guideline("share.65")
	gShare85       = guideline("share.85")
	gAtwaterCho    = guideline("atwater.cho")
	gAtwaterProt   = guideline("atwater.protein")
	gAtwaterFat    = guideline("atwater.fat")
	gKJPerKcal     = guideline("kj-per-kcal")
	gMET           = guideline("met")

	gModelTypical  = guideline("model.typical-density")
	gModelCapacity = guideline("model.capacity-density")
	gModelLiver    = guideline("model.liver-per-kg")
	gIntFactor     = guideline("model.intensity-factor")
	gIntClamp      = guideline("model.intensity-factor-clamp")
	gBandMinutes   = guideline("model.load-band-minutes")
	gBandVeryHighM = guideline("model.load-band-very-high")
	gCoverPct      = guideline("model.cover-intensity")
	gShareClamp    = guideline("model.cho-share-clamp")
	gRER           = guideline("rer.nonprotein")
	gDemanding     = guideline("model.demanding-session")
	gDemandingMin  = guideline("model.demanding-session-min")
	gPreProtein    = guideline("pre-event.protein")
	gRefuelEvery   = guideline("repletion.feed-every")
	gNextClear     = guideline("model.next-start-clear")
	gMealClear     = guideline("model.meal-clear")
	gStartSince    = guideline("model.start-since-exercise")
	gMealEvery     = guideline("protein.meal-interval")
	gRefuelStart   = guideline("repletion.start-within")
	gTaperDays     = guideline("model.taper-days")
	gRefFat        = guideline("model.reference-fat")
	gFatExtremeF   = guideline("model.body-fat-extreme")
	gFatExtremeM   = guideline("model.body-fat-extreme-men")
	gModelGut      = guideline("model.gut-absorption")
	gModelBoost    = guideline("model.window-boost")
	gModelSlow     = guideline("model.window-slow")
	gRecruit       = guideline("model.fibre-recruitment")
	gModelSupply   = guideline("model.synthesis-supply")
	gModelMuscleFr = guideline("model.run-fraction")
	gRateStep      = guideline("during.rate-step")
	gSessionMatch  = guideline("model.session-match")
	gRestMeal      = guideline("model.rest-meal")
	gRestMealLunch = guideline("model.rest-meal-lunch")

	gWorkSwim        = guideline("model.working.swim")
	gWorkRow         = guideline("model.working.row")
	gWorkTri         = guideline("model.working.triathlon")
	gRestOx          = guideline("model.rest-cho-ox")
	gLiverShare      = guideline("model.liver-share")
	gDailyMuscle     = guideline("model.daily-muscle")
	gOvernightFall   = guideline("liver.overnight-fall")
	gOvernightHours  = guideline("liver.overnight-hours")
	gLiverFloor      = guideline("model.liver-floor")
	gGluconeogenesis = guideline("model.gluconeogenesis")
	gFatUpper        = guideline("fat.upper")
	gFatUpperEvent   = guideline("fat.upper-event")
	gRestSynth       = guideline("model.rest-synthesis")
	gRestLevel       = guideline("model.rest-level")
	gResynthPeak     = guideline("model.resynthesis-peak")
	gCoverEasy       = guideline("model.cover-easy")
	gLongFloor       = guideline("during.long-floor")
	gPreEarliest     = guideline("pre-event.earliest")
	gLoadTwoDay      = guideline("load.target.two-day")
	gLoadOther       = guideline("load.target.other")
	gProteinTarget   = guideline("protein.target")
	gFatShare        = guideline("fat.share")
	gRecoveryFeed    = guideline("recovery.feed")
	gMarathonWall    = guideline("marathon.wall")
	gEasy            = guideline("model.intensity.easy")
	gModerate        = guideline("model.intensity.moderate")
	gHard            = guideline("model.intensity.hard")
	gRPE             = guideline("model.intensity.rpe")
	gSessionStart    = guideline("model.session-start")
	gPreDefaultH     = guideline("pre-event.default-hours")
	gLiver70         = guideline("liver.fed-70kg")
	gMuscle70        = guideline("muscle.70kg")
)

// metFor returns the MET table entry of a modality.
func metFor(modality string) Guideline {
	switch modality {
	case "run", "cycle", "swim", "row", "ski", "triathlon", "team", "strength":
		return guideline("met." + modality)
	}
	return guideline("met.other")
}
