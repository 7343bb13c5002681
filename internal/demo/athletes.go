package demo

import (
	"math"
	"time"

	"larder/internal/fuel"
)

// The athletes of the demo practice. All people, clubs and races are
// invented; the training is a plausible week for each sport, not advice.
func athletes() []athlete {
	return []athlete{
		{
			key: "marathoner", name: "Maren Solvik", sex: "female", age: 34, birthMonthsAgo: 5, heightCm: 167,
			sport: "Marathon", unit: "kg", baseKg: 58.4, trendKgPerWeek: -0.08, method: "scale, morning, fasted",
			fatPct: 19.5, fatMethod: "skinfolds (7 sites)",
			notes: "Spring marathon is the season's goal; aims to run under 3:15. Prefers rice and bread to pasta.",
			week: func(wd time.Weekday, weeksToGo int) []session {
				long := 110 + 10*min(4, max(0, 6-weeksToGo)) // builds to 150 min
				if weeksToGo <= 2 {
					long = 90 // taper
				}
				switch wd {
				case time.Tuesday:
					return []session{rpe(clock("06:30"), "run", 60, 8, km(12), "6 × 1 km at 10 km pace")}
				case time.Wednesday:
					return []session{zone(clock("18:00"), "run", 45, "endurance", km(8.5), "")}
				case time.Thursday:
					return []session{zone(clock("06:30"), "run", 70, "tempo", km(14), "2 × 20 min at marathon pace")}
				case time.Friday:
					return []session{rpe(clock("07:00"), "strength", 40, 5, nil, "gym: legs and core")}
				case time.Saturday:
					return []session{zone(clock("09:00"), "run", 45, "recovery", km(8), "")}
				case time.Sunday:
					return []session{zone(clock("08:00"), "run", long, "endurance", km(math.Round(float64(long)/4.8)), "long run with gels every 30 min")}
				}
				return nil
			},
			events: []event{
				{key: "marathon", name: "Fjordby Spring Marathon", zone: "Europe/Oslo", modality: "run", priority: "A",
					inDays: 42, hour: 9, minute: 0, min: 195, days: 1, km: km(42.195), notes: "Flat course; drinks stations every 5 km."},
				{key: "half", name: "Harbour Lights Half", zone: "Europe/Oslo", modality: "run", priority: "B",
					inDays: 14, hour: 10, minute: 30, min: 90, days: 1, km: km(21.1), notes: "Dress rehearsal for race-day fuelling."},
			},
		},
		{
			key: "cyclist", name: "Tomás Arriaga", sex: "male", age: 29, birthMonthsAgo: 9, heightCm: 181,
			sport: "Road cycling", unit: "kg", baseKg: 73.1, trendKgPerWeek: -0.1, method: "scale, morning, fasted",
			notes: "Team rider; power meter on every bike. Stage race in the hills is his A event.",
			week: func(wd time.Weekday, weeksToGo int) []session {
				scale := 1.0
				if weeksToGo <= 1 {
					scale = 0.6
				}
				m := func(x int) int { return int(float64(x) * scale) }
				switch wd {
				case time.Monday:
					return []session{rpe(clock("17:30"), "strength", 45, 6, nil, "")}
				case time.Tuesday:
					return []session{pct(clock("09:00"), "cycle", m(90), 80, km(45), "3 × 12 min at threshold")}
				case time.Wednesday:
					return []session{zone(clock("09:00"), "cycle", m(150), "endurance", km(70), "")}
				case time.Thursday:
					return []session{zone(clock("10:00"), "cycle", 60, "recovery", km(25), "")}
				case time.Saturday:
					return []session{zone(clock("08:30"), "cycle", m(270), "endurance", km(130), "group ride, 2,000 m climbing")}
				case time.Sunday:
					return []session{zone(clock("09:00"), "cycle", m(180), "tempo", km(90), "")}
				}
				return nil
			},
			events: []event{
				{key: "stage-race", name: "Tour of the Three Valleys", zone: "Europe/Madrid", modality: "cycle", priority: "A",
					inDays: 35, hour: 11, minute: 0, min: 250, days: 4, km: km(145), notes: "Four stages over three days; a short time trial and a hilly stage share the last day. Two mountain-top finishes.",
					stages: []demoStage{
						{day: 0, hour: 11, minute: 0, km: 145, min: 250, watts: 225},
						{day: 1, hour: 11, minute: 30, km: 170, min: 280, watts: 220},
						{day: 2, hour: 9, minute: 30, km: 22, min: 32, watts: 320},
						{day: 2, hour: 16, minute: 0, km: 110, min: 165, watts: 235},
					}},
			},
		},
		{
			key: "rower", name: "Callum Reid", sex: "male", age: 23, birthMonthsAgo: 2, heightCm: 194,
			sport: "Rowing (heavyweight)", unit: "kg", baseKg: 92.0, trendKgPerWeek: 0.05, method: "scale, after first session",
			fatPct: 12.5, fatMethod: "DXA",
			notes: "University eight. Trains twice a day six days a week; often misses breakfast before the early outing.",
			week: func(wd time.Weekday, weeksToGo int) []session {
				if wd == time.Sunday {
					return []session{zone(clock("07:00"), "row", 90, "endurance", km(20), "")}
				}
				am := zone(clock("06:00"), "row", 75, "endurance", km(16), "water session")
				switch wd {
				case time.Tuesday, time.Thursday:
					return []session{am, rpe(clock("16:30"), "row", 60, 8, km(12), "ergometer: 4 × 2,000 m")}
				case time.Monday, time.Wednesday, time.Friday:
					return []session{am, rpe(clock("16:30"), "strength", 60, 7, nil, "weights")}
				case time.Saturday:
					return []session{am, zone(clock("15:00"), "row", 60, "recovery", km(12), "")}
				}
				return nil
			},
			events: []event{
				{key: "head-race", name: "Riverside Head of the River", zone: "Europe/London", modality: "row", priority: "A",
					inDays: 21, hour: 11, minute: 15, min: 20, days: 1, km: km(6.8), notes: "Time trial; crews start 10 s apart."},
			},
		},
		{
			key: "triathlete", name: "Priya Venkataraman", sex: "female", age: 31, birthMonthsAgo: 7, heightCm: 162,
			sport: "Triathlon (standard distance)", unit: "kg", baseKg: 55.2, trendKgPerWeek: 0, method: "scale, morning, fasted",
			cautions: "Type 1 diabetes (insulin pump). Any change to carbohydrate around training or racing must be agreed with her diabetes team; she checks glucose before, during and after sessions.",
			notes:    "Works with her endocrinologist on insulin adjustments; carries glucose tablets on every session.",
			week: func(wd time.Weekday, weeksToGo int) []session {
				switch wd {
				case time.Monday:
					return []session{rpe(clock("06:30"), "swim", 60, 6, km(3), "")}
				case time.Tuesday:
					return []session{zone(clock("06:30"), "cycle", 90, "endurance", km(40), "")}
				case time.Wednesday:
					return []session{zone(clock("18:00"), "run", 50, "tempo", km(10), "")}
				case time.Thursday:
					return []session{rpe(clock("06:30"), "swim", 45, 7, km(2.4), "")}
				case time.Saturday:
					return []session{zone(clock("07:00"), "cycle", 120, "endurance", km(55), "brick: bike then run"), zone(clock("09:05"), "run", 30, "tempo", km(6), "off the bike")}
				case time.Sunday:
					return []session{zone(clock("08:00"), "run", 80, "endurance", km(15), "")}
				}
				return nil
			},
			events: []event{
				{key: "triathlon", name: "Coastline Standard Triathlon", zone: "Australia/Perth", modality: "triathlon", priority: "A",
					inDays: 49, hour: 7, minute: 0, min: 150, days: 1, km: km(51.5), notes: "1.5 km sea swim, 40 km bike, 10 km run.",
					// The legs as raced, so no carbohydrate is planned in the swim.
					legs: []fuel.Segment{{Modality: "swim", DistanceKm: km(1.5), ExpectedDurationMin: 30}, {Modality: "transition", ExpectedDurationMin: 3},
						{Modality: "cycle", DistanceKm: km(40), ExpectedDurationMin: 70}, {Modality: "transition", ExpectedDurationMin: 2},
						{Modality: "run", DistanceKm: km(10), ExpectedDurationMin: 45}}},
			},
		},
		{
			key: "trail", name: "Jonah Whitfield", sex: "male", age: 41, birthMonthsAgo: 11, heightCm: 176,
			sport: "Trail running", unit: "lb", baseKg: 70.5, trendKgPerWeek: -0.12, method: "home scale",
			cautions: "Coeliac disease: strictly gluten-free.\nHistory of gut upset on long runs (cramping, urgency). Trial any race food in training first; low-fibre choices in the 24 h before long efforts.",
			notes:    "Enters his body mass in pounds.",
			week: func(wd time.Weekday, weeksToGo int) []session {
				switch wd {
				case time.Tuesday:
					return []session{rpe(clock("06:00"), "run", 60, 7, km(11), "hill repeats")}
				case time.Thursday:
					return []session{zone(clock("06:00"), "run", 50, "endurance", km(9), "")}
				case time.Saturday:
					return []session{zone(clock("07:00"), "run", 180, "endurance", km(28), "trail, 900 m climbing")}
				case time.Sunday:
					return []session{zone(clock("08:00"), "cycle", 60, "recovery", km(22), "")}
				}
				return nil
			},
			events: []event{
				{key: "ultra", name: "High Mesa 50K", zone: "America/Denver", modality: "run", priority: "A",
					inDays: 70, hour: 6, minute: 30, min: 330, days: 1, km: km(50), notes: "2,100 m climbing; aid stations about every 8 km."},
			},
		},
	}
}
