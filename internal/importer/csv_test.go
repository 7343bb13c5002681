package importer

import (
	"math"
	"strings"
	"testing"
	"time"
)

func massSheet(t *testing.T, csv string, opt Options) *Sheet {
	t.Helper()
	opt.Kind = KindBodyMass
	sh, err := ReadCSV([]byte(csv), opt)
	if err != nil {
		t.Fatalf("ReadCSV: %v", err)
	}
	return sh
}

func day(y, m, d int) time.Time { return time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC) }

// Each delimiter a spreadsheet writes, with the decimal mark that goes with it.
func TestDelimiters(t *testing.T) {
	for _, tc := range []struct {
		name  string
		csv   string
		delim rune
	}{
		{"comma", "date,mass\n2026-03-01,72.4\n2026-03-02,72.1\n", ','},
		{"semicolon with decimal comma", "date;mass\n2026-03-01;72,4\n2026-03-02;72,1\n", ';'},
		{"tab", "date\tmass\n2026-03-01\t72.4\n2026-03-02\t72,1\n", '\t'},
		{"comma with quoted decimal comma", "date,mass\n2026-03-01,\"72,4\"\n2026-03-02,\"72,1\"\n", ','},
		{"CRLF and byte-order mark", "\ufeffdate;mass\r\n2026-03-01;72,4\r\n2026-03-02;72,1\r\n", ';'},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sh := massSheet(t, tc.csv, Options{})
			if sh.Delimiter != tc.delim {
				t.Fatalf("delimiter %q, want %q", sh.Delimiter, tc.delim)
			}
			if len(sh.Problems) != 0 || len(sh.Mass) != 2 {
				t.Fatalf("rows %d problems %v", len(sh.Mass), sh.Problems)
			}
			if sh.Mass[0].MassKg != 72.4 || sh.Mass[1].MassKg != 72.1 || !sh.Mass[0].On.Equal(day(2026, 3, 1)) {
				t.Fatalf("rows %+v", sh.Mass)
			}
		})
	}
}

// kg and lb from the header, a unit column, a suffix and the default. The
// pound is 0.45359237 kg exactly (International Yard and Pound Agreement, 1959).
func TestMassUnits(t *testing.T) {
	for _, tc := range []struct {
		name string
		csv  string
		opt  Options
		kg   float64
		unit string
	}{
		{"kg default", "date,mass\n2026-03-01,70\n", Options{}, 70, "kg"},
		{"lb default", "date,mass\n2026-03-01,154.3\n", Options{MassUnit: "lb"}, 69.99, "lb"},
		{"header (lb)", "date,Weight (lb)\n2026-03-01,154.3\n", Options{}, 69.99, "lb"},
		{"header mass_kg", "date,mass_kg\n2026-03-01,70\n", Options{MassUnit: "lb"}, 70, "kg"},
		{"unit column", "date,mass,unit\n2026-03-01,154.3,lbs\n", Options{}, 69.99, "lb"},
		{"suffix", "date,mass\n2026-03-01,154.3 lb\n", Options{}, 69.99, "lb"},
		{"suffix kg over lb default", "date,mass\n2026-03-01,70kg\n", Options{MassUnit: "lb"}, 70, "kg"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sh := massSheet(t, tc.csv, tc.opt)
			if len(sh.Mass) != 1 {
				t.Fatalf("rows %v problems %v", sh.Mass, sh.Problems)
			}
			if m := sh.Mass[0]; math.Abs(m.MassKg-tc.kg) > 0.005 || m.Unit != tc.unit {
				t.Fatalf("got %.2f %s, want %.2f %s", m.MassKg, m.Unit, tc.kg, tc.unit)
			}
		})
	}
}

func TestDateFormats(t *testing.T) {
	for _, tc := range []struct {
		name  string
		dates []string
		given string
		want  []time.Time
		ask   bool
		order string
	}{
		{"ISO", []string{"2026-03-01", "2026-12-31"}, "", []time.Time{day(2026, 3, 1), day(2026, 12, 31)}, false, OrderDMY},
		{"d/m/y told by a day over 12", []string{"01/03/2026", "31/03/2026"}, "", []time.Time{day(2026, 3, 1), day(2026, 3, 31)}, false, OrderDMY},
		{"m/d/y told by a day over 12", []string{"03/01/2026", "03/31/2026"}, "", []time.Time{day(2026, 3, 1), day(2026, 3, 31)}, false, OrderMDY},
		{"ambiguous asks", []string{"01/03/2026", "02/03/2026"}, "", nil, true, ""},
		{"ambiguous answered d/m/y", []string{"01/03/2026", "02/03/2026"}, OrderDMY, []time.Time{day(2026, 3, 1), day(2026, 3, 2)}, false, OrderDMY},
		{"ambiguous answered m/d/y", []string{"01/03/2026", "02/03/2026"}, OrderMDY, []time.Time{day(2026, 1, 3), day(2026, 2, 3)}, false, OrderMDY},
		{"dotted", []string{"1.3.2026", "15.3.2026"}, "", []time.Time{day(2026, 3, 1), day(2026, 3, 15)}, false, OrderDMY},
		{"same day and month is not ambiguous", []string{"03/03/2026"}, "", []time.Time{day(2026, 3, 3)}, false, OrderDMY},
	} {
		t.Run(tc.name, func(t *testing.T) {
			csv := "date,mass\n"
			for _, d := range tc.dates {
				csv += d + ",70\n"
			}
			sh := massSheet(t, csv, Options{DateOrder: tc.given})
			if sh.DateOrderNeeded != tc.ask {
				t.Fatalf("DateOrderNeeded = %v", sh.DateOrderNeeded)
			}
			if tc.ask {
				if len(sh.Mass) != 0 || sh.AmbiguousExample != tc.dates[0] {
					t.Fatalf("asked but read rows %v, example %q", sh.Mass, sh.AmbiguousExample)
				}
				return
			}
			if sh.DateOrder != tc.order || len(sh.Mass) != len(tc.want) {
				t.Fatalf("order %q rows %v problems %v", sh.DateOrder, sh.Mass, sh.Problems)
			}
			for i, w := range tc.want {
				if !sh.Mass[i].On.Equal(w) {
					t.Errorf("row %d: %s, want %s", i, sh.Mass[i].On.Format(time.DateOnly), w.Format(time.DateOnly))
				}
			}
		})
	}
}

func TestHeaderVariants(t *testing.T) {
	for _, header := range []string{
		"date,mass,body fat %,method",
		"Method,Body Fat %,Body Mass,Date",
		"MEASURED_ON;Weight;bf;how measured",
		" Day , body-mass , fat % , scale ",
	} {
		t.Run(header, func(t *testing.T) {
			sh := massSheet(t, header+"\n", Options{})
			if !sh.Ready() {
				t.Fatalf("not ready: unknown %v missing %v", sh.Unknown, sh.Missing)
			}
			for _, f := range []string{FieldDate, FieldMass, FieldBodyFat, FieldMethod} {
				if sh.col(f) == nil {
					t.Errorf("no column for %s in %+v", f, sh.Columns)
				}
			}
		})
	}
	// Columns in any order give the same row.
	a := massSheet(t, "date,mass,body fat %,method\n2026-03-01,70,12.5,DXA\n", Options{})
	b := massSheet(t, "method;body fat %;mass;date\nDXA;12,5;70;2026-03-01\n", Options{})
	if len(a.Mass) != 1 || len(b.Mass) != 1 || *a.Mass[0].BodyFatPct != *b.Mass[0].BodyFatPct || a.Mass[0].Method != b.Mass[0].Method || a.Mass[0].MassKg != b.Mass[0].MassKg {
		t.Fatalf("%+v vs %+v", a.Mass, b.Mass)
	}
}

func TestMappingStep(t *testing.T) {
	csv := "when,kilos,remark\n2026-03-01,70,after run\n"
	sh := massSheet(t, csv, Options{})
	if sh.Ready() || len(sh.Unknown) != 3 || len(sh.Missing) != 2 {
		t.Fatalf("want 3 unknown and 2 missing, got %v / %v", sh.Unknown, sh.Missing)
	}
	sh = massSheet(t, csv, Options{Mapping: map[string]string{"when": FieldDate, "kilos": FieldMass, "remark": Ignore}})
	if !sh.Ready() || len(sh.Mass) != 1 || sh.Mass[0].MassKg != 70 {
		t.Fatalf("mapped: %+v %v", sh.Mass, sh.Problems)
	}
}

func TestRowErrorsNameLineColumnAndReason(t *testing.T) {
	csv := "date,mass,body fat %\n" +
		"2026-03-01,70,12\n" + // line 2 good
		"2026-02-30,70,\n" + // line 3 no such day
		"2026-03-03,7o,\n" + // line 4 not a number
		"2026-03-04,900,\n" + // line 5 out of range
		"2026-03-05,70,75\n" + // line 6 body fat out of range
		",70,\n" + // line 7 date missing
		"2026-03-07,70 st,\n" + // line 8 unknown unit
		"\n" + // blank lines are skipped
		"2026-03-09,\"1,234.5\",5\n" // line 10 two decimal marks
	sh := massSheet(t, csv, Options{})
	want := []Problem{
		{3, "date", "is not a day of the calendar"},
		{4, "mass", "is not a number of kg or lb"},
		{5, "mass", "outside 20 to 300 kg"},
		{6, "body fat %", "outside 2–60"},
		{7, "date", "The date is missing"},
		{8, "mass", "is not a number of kg or lb"},
		{10, "mass", "thousands separators"},
	}
	if len(sh.Mass) != 1 || sh.Mass[0].Line != 2 {
		t.Fatalf("good rows %+v", sh.Mass)
	}
	if len(sh.Problems) != len(want) {
		t.Fatalf("problems %+v", sh.Problems)
	}
	for i, w := range want {
		p := sh.Problems[i]
		if p.Line != w.Line || p.Column != w.Column || !strings.Contains(p.Reason, w.Reason) {
			t.Errorf("problem %d = %+v, want line %d column %q reason containing %q", i, p, w.Line, w.Column, w.Reason)
		}
	}
}

func TestFilesRefused(t *testing.T) {
	for name, data := range map[string]string{
		"empty":          "",
		"binary":         "PK\x03\x04\x00\x00binary",
		"not utf-8":      "date,mass\n2026-03-01,70\xff\n",
		"only blank":     "\n\n  \n",
		"duplicate cols": "date,mass,weight\n2026-03-01,70,70\n",
	} {
		if _, err := ReadCSV([]byte(data), Options{Kind: KindBodyMass}); err == nil {
			t.Errorf("%s: accepted", name)
		} else if _, ok := err.(*FileError); !ok {
			t.Errorf("%s: error %T %v is not a FileError", name, err, err)
		}
	}
}

func TestTrainingRows(t *testing.T) {
	csv := "date;start;activity;duration;distance (mi);rpe;zone;avg hr;avg power;status;notes\n" +
		"2026-03-01;07:30;Running;45;6,2;6;;150;;done;easy\n" + // line 2: minutes, miles
		"2026-03-02;;bike;1:30:00;;;tempo;;210;planned;\n" + // line 3: h:mm:ss, zone, power
		"2026-03-03 18:05;;swim;0:50;2;;;;;;\n" + // line 4: start in the date column, h:mm, default zone
		"2026-03-04;;curling;30;;;;;;;\n" + // line 5: unknown activity
		"2026-03-05;25:00;run;30;;;;;;;\n" + // line 6: bad time
		"2026-03-06;;run;;;;;;;;\n" + // line 7: duration missing
		"2026-03-07;;run;1:75:00;;;;;;;\n" + // line 8: bad duration
		"2026-03-08;;run;30;;11;;;;;\n" // line 9: RPE out of range
	sh, err := ReadCSV([]byte(csv), Options{Kind: KindTraining, DefaultZone: "endurance"})
	if err != nil {
		t.Fatal(err)
	}
	if len(sh.Sessions) != 3 {
		t.Fatalf("sessions %+v problems %+v", sh.Sessions, sh.Problems)
	}
	a, b, c := sh.Sessions[0], sh.Sessions[1], sh.Sessions[2]
	// 6.2 mi × 1.609344 km/mi = 9.978 km
	if a.Start != "07:30" || a.Modality != "run" || a.DurationMin != 45 || a.DistanceKm == nil || *a.DistanceKm != 9.978 ||
		a.IntensityKind != "rpe" || *a.IntensityValue != 6 || *a.AvgHeartRate != 150 || a.Notes != "easy" {
		t.Errorf("line 2: %+v", a)
	}
	if b.Modality != "cycle" || b.DurationMin != 90 || b.IntensityZone != "tempo" || *b.AvgPowerW != 210 || b.Status != "planned" {
		t.Errorf("line 3: %+v", b)
	}
	if c.Start != "18:05" || c.DurationMin != 50 || !c.IntensityAssumed || c.IntensityZone != "endurance" || *c.DistanceKm != 3.219 {
		t.Errorf("line 4: %+v", c)
	}
	wantLines := []int{5, 6, 7, 8, 9}
	if len(sh.Problems) != len(wantLines) {
		t.Fatalf("problems %+v", sh.Problems)
	}
	for i, l := range wantLines {
		if sh.Problems[i].Line != l || sh.Problems[i].Column == "" {
			t.Errorf("problem %d: %+v, want line %d with a column", i, sh.Problems[i], l)
		}
	}
}

func TestDurations(t *testing.T) {
	for _, tc := range []struct {
		in, unit string
		want     int
	}{
		{"45", "", 45}, {"45,5", "", 46}, {"1:30:00", "", 90}, {"1:30", "", 90}, {"0:00:20", "", 1},
		{"5400", durSeconds, 90}, {"1.5", durHours, 90}, {"24:00:00", "", 1440},
	} {
		got, err := parseDuration(tc.in, tc.unit)
		if err != nil || got != tc.want {
			t.Errorf("parseDuration(%q, %q) = %d, %v; want %d", tc.in, tc.unit, got, err, tc.want)
		}
	}
	for _, bad := range []string{"", "0", "-5", "24:01:00", "1:5", "abc", "1:2:3:4"} {
		if _, err := parseDuration(bad, ""); err == nil {
			t.Errorf("parseDuration(%q) accepted", bad)
		}
	}
}

func TestPracticeFile(t *testing.T) {
	csv := "client,date of birth,date,mass\nMaren Solvik,1994-05-02,2026-03-01,61\nMaren Solvik,,2026-03-02,61\n"
	sh, err := ReadCSV([]byte(csv), Options{Kind: KindBodyMass, Practice: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(sh.Mass) != 1 || sh.Mass[0].Client.Name != "Maren Solvik" || !sh.Mass[0].Client.DOB.Equal(day(1994, 5, 2)) {
		t.Fatalf("rows %+v", sh.Mass)
	}
	if len(sh.Problems) != 1 || sh.Problems[0].Line != 3 || sh.Problems[0].Column != "date of birth" {
		t.Fatalf("problems %+v", sh.Problems)
	}
	// Without the client columns a practice file asks for them.
	sh, _ = ReadCSV([]byte("date,mass\n2026-03-01,61\n"), Options{Kind: KindBodyMass, Practice: true})
	if len(sh.Missing) != 2 {
		t.Fatalf("missing %v", sh.Missing)
	}
}

func TestTemplateReadsBack(t *testing.T) {
	for _, k := range []Kind{KindBodyMass, KindTraining} {
		for _, practice := range []bool{false, true} {
			h := strings.Join(TemplateHeader(k, practice), ",")
			sh, err := ReadCSV([]byte(h+"\n"), Options{Kind: k, Practice: practice})
			if err != nil || !sh.Ready() || len(sh.Columns) != len(Fields(k, practice)) {
				t.Errorf("%s practice=%v: template header %q not read back: %v %+v %+v", k, practice, h, err, sh.Unknown, sh.Missing)
			}
		}
	}
}
