package importer

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"
)

// FileError is a file refused as a whole (not text, no header, ...). Its
// message is written for the person who chose the file.
type FileError struct{ Reason string }

func (e *FileError) Error() string { return e.Reason }

func refuse(reason string) error { return &FileError{Reason: reason} }

// Options steer the reading of a CSV file; the zero value reads a single
// client's file with masses in kg and asks about ambiguous dates.
type Options struct {
	Kind Kind
	// Practice: the file holds several clients, named by name and date of
	// birth in each row.
	Practice bool
	// DateOrder is OrderDMY or OrderMDY when the person has said how dates
	// like 03/04/2026 are meant; "" to ask when the file does not tell.
	DateOrder string
	// MassUnit is the unit of masses written without one ("kg" or "lb").
	MassUnit string
	// Mapping gives a field (or Ignore) to headers not recognised, keyed by
	// NormHeader of the header.
	Mapping map[string]string
	// DefaultZone is the intensity zone given to sessions whose row names
	// none (the training log needs one); "" refuses such rows.
	DefaultZone string
}

// Column is one column of the file as read.
type Column struct {
	Index  int
	Header string
	Field  string // "" when not recognised and not mapped
	Unit   string // unit carried by the header, if any
}

// Problem is one row (or cell) that cannot be imported.
type Problem struct {
	Line   int    // line of the file, counting the header as line 1
	Column string // header of the column at fault, "" for the whole row
	Reason string
}

// ClientRef names a client in a practice-wide file.
type ClientRef struct {
	Name string
	DOB  time.Time
}

// MassRow is a body-mass measurement read from a line.
type MassRow struct {
	Line       int
	Client     ClientRef
	On         time.Time
	MassKg     float64
	BodyFatPct *float64
	Method     string
	Unit       string // kg | lb, as written
}

// SessionRow is a training session read from a line or an activity file.
type SessionRow struct {
	Line           int
	Source         string // file name for activity files
	Client         ClientRef
	On             time.Time
	Start          string // "HH:MM" or ""
	Modality       string
	DurationMin    int
	IntensityKind  string // rpe | zone | pct_vo2max
	IntensityValue *float64
	IntensityZone  string
	// IntensityAssumed: the row named no intensity and DefaultZone was used.
	IntensityAssumed bool
	DistanceKm       *float64
	AvgHeartRate     *int
	AvgPowerW        *int
	Status           string
	Notes            string
}

// Sheet is a CSV file as read: its columns, the good rows and the problems.
type Sheet struct {
	Kind      Kind
	Delimiter rune
	Columns   []Column
	// Unknown are columns whose header was not recognised and has no
	// mapping yet; Missing are required fields no column holds. Either stops
	// the rows from being read until the person maps the columns.
	Unknown []Column
	Missing []FieldInfo
	// DateOrderNeeded: the dates could be read day-first or month-first and
	// the file does not tell which; AmbiguousExample is one such date.
	DateOrderNeeded  bool
	AmbiguousExample string
	DateOrder        string // the order used (given or found), or ""
	Mass             []MassRow
	Sessions         []SessionRow
	Problems         []Problem
	DataLines        int // lines below the header, blank ones left out
}

// Ready reports whether the rows were read (no mapping or date question open).
func (s *Sheet) Ready() bool {
	return len(s.Unknown) == 0 && len(s.Missing) == 0 && !s.DateOrderNeeded
}

// MaxLines bounds a CSV import; a practice's whole history fits well within it.
const MaxLines = 500_000

// ReadCSV reads a CSV file of body mass or training. A file that is not a
// text CSV is refused with a *FileError; everything else comes back in the
// Sheet, row by row.
func ReadCSV(data []byte, opt Options) (*Sheet, error) {
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	if err := looksLikeText(data); err != nil {
		return nil, err
	}
	delim := sniffDelimiter(data)
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = delim
	r.FieldsPerRecord = -1
	r.LazyQuotes = true
	r.ReuseRecord = true
	header, err := r.Read()
	for err == nil && blank(header) {
		header, err = r.Read()
	}
	if err == io.EOF {
		return nil, refuse("The file is empty: it has no header line.")
	}
	if err != nil {
		return nil, refuse("The file could not be read as CSV: " + plainCSVError(err))
	}
	sh := &Sheet{Kind: opt.Kind, Delimiter: delim}
	if err := sh.mapColumns(header, opt); err != nil {
		return nil, err
	}
	var records [][]string
	var lines []int
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		line, _ := r.FieldPos(0)
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				line = pe.Line
			}
			sh.Problems = append(sh.Problems, Problem{Line: line, Reason: "The line could not be read as CSV: " + plainCSVError(err)})
			continue
		}
		if blank(rec) {
			continue
		}
		if len(records) >= MaxLines {
			return nil, refuse("The file has more than " + strconv.Itoa(MaxLines) + " lines; split it into smaller files.")
		}
		records = append(records, append([]string(nil), rec...))
		lines = append(lines, line)
	}
	sh.DataLines = len(records)
	// The date question is asked together with any column question.
	sh.settleDateOrder(records, opt.DateOrder)
	if !sh.Ready() {
		return sh, nil
	}
	for i, rec := range records {
		sh.readRow(lines[i], rec, opt)
	}
	return sh, nil
}

// looksLikeText refuses files that are not UTF-8 text: a spreadsheet saved
// in its own binary format, an image, a FIT file chosen by mistake.
func looksLikeText(data []byte) error {
	if len(bytes.TrimSpace(data)) == 0 {
		return refuse("The file is empty.")
	}
	head := data
	if len(head) > 1<<16 {
		head = head[:1<<16]
	}
	if bytes.IndexByte(head, 0) >= 0 {
		return refuse("This is not a CSV file: it holds binary data. Save the sheet as CSV (comma- or semicolon-separated text) and choose that file.")
	}
	if !utf8.Valid(data) {
		return refuse("The file is not UTF-8 text. Save the sheet as \"CSV UTF-8\" and choose that file again.")
	}
	return nil
}

func blank(rec []string) bool {
	for _, f := range rec {
		if strings.TrimSpace(f) != "" {
			return false
		}
	}
	return true
}

func plainCSVError(err error) string {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		switch pe.Err {
		case csv.ErrQuote, csv.ErrBareQuote:
			return "a quotation mark is not closed."
		}
		return pe.Err.Error() + "."
	}
	return err.Error()
}

// sniffDelimiter picks the delimiter (comma, semicolon or tab) that splits
// the header line into the most fields and the following lines into the
// same number. A sheet saved where the comma is the decimal mark uses
// semicolons, so the decimal commas of its numbers must not win: the header
// line, which holds no numbers, decides first.
func sniffDelimiter(data []byte) rune {
	best, bestScore := ',', -1
	for _, d := range []rune{',', ';', '\t'} {
		r := csv.NewReader(bytes.NewReader(data))
		r.Comma = d
		r.FieldsPerRecord = -1
		r.LazyQuotes = true
		var counts []int
		for len(counts) < 20 {
			rec, err := r.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				continue
			}
			if blank(rec) {
				continue
			}
			counts = append(counts, len(rec))
		}
		if len(counts) == 0 || counts[0] < 2 {
			continue
		}
		same := 0
		for _, c := range counts[1:] {
			if c == counts[0] {
				same++
			}
		}
		score := counts[0]*100 + same
		if score > bestScore {
			best, bestScore = d, score
		}
	}
	return best
}

func (sh *Sheet) mapColumns(header []string, opt Options) error {
	seen := map[string]string{}
	allowed := map[string]bool{}
	for _, f := range Fields(opt.Kind, opt.Practice) {
		allowed[f.Key] = true
	}
	for i, h := range header {
		h = strings.TrimSpace(strings.TrimPrefix(h, "\ufeff"))
		col := Column{Index: i, Header: h}
		field, unit := recognise(h)
		if m, ok := opt.Mapping[NormHeader(h)]; ok && m != "" {
			field = m
		}
		if field == FieldClient && !opt.Practice {
			// A client column in a single client's file says nothing new.
			field = Ignore
		}
		if field == FieldBirth && !opt.Practice {
			field = Ignore
		}
		if field != "" && field != Ignore && !allowed[field] {
			field = ""
		}
		if h == "" && field == "" {
			field = Ignore
		}
		col.Field, col.Unit = field, unit
		if field != "" && field != Ignore {
			if prev, dup := seen[field]; dup {
				return refuse("Two columns, " + strconv.Quote(prev) + " and " + strconv.Quote(h) + ", both hold the same thing; remove one or map it to \"leave out\".")
			}
			seen[field] = h
		}
		sh.Columns = append(sh.Columns, col)
		if field == "" {
			sh.Unknown = append(sh.Unknown, col)
		}
	}
	for _, f := range Fields(opt.Kind, opt.Practice) {
		if _, ok := seen[f.Key]; f.Required && !ok {
			sh.Missing = append(sh.Missing, f)
		}
	}
	return nil
}

// col returns the column holding a field, or nil.
func (sh *Sheet) col(field string) *Column {
	for i := range sh.Columns {
		if sh.Columns[i].Field == field {
			return &sh.Columns[i]
		}
	}
	return nil
}

// settleDateOrder decides how numeric dates are read: the person's answer
// when given, else what the dates themselves show (a 31/01 can only be
// day-first), else it asks when any date could be read both ways.
func (sh *Sheet) settleDateOrder(records [][]string, given string) {
	sh.DateOrder = given
	if given == OrderDMY || given == OrderMDY {
		return
	}
	var cols []int
	for _, f := range []string{FieldDate, FieldBirth} {
		if c := sh.col(f); c != nil {
			cols = append(cols, c.Index)
		}
	}
	dmy, mdy := false, false
	example := ""
	for _, rec := range records {
		for _, i := range cols {
			if i >= len(rec) {
				continue
			}
			switch dateHint(rec[i]) {
			case OrderDMY:
				dmy = true
			case OrderMDY:
				mdy = true
			}
			if example == "" && isAmbiguousDate(rec[i]) {
				example = strings.TrimSpace(rec[i])
			}
		}
	}
	switch {
	case dmy && !mdy:
		sh.DateOrder = OrderDMY
	case mdy && !dmy:
		sh.DateOrder = OrderMDY
	case example != "" || (dmy && mdy):
		// Both readings occur, or nothing tells: ask.
		sh.DateOrderNeeded = true
		sh.AmbiguousExample = example
	default:
		sh.DateOrder = OrderDMY // no numeric date can be misread either way
	}
}
