package fuel

import (
	"strconv"
)

// How a finding is recorded and its message written, cheaply: the planner
// makes dozens of findings per plan.

// find records a finding. The message is formatted by appendf into a
// buffer reused across findings, so each finding costs one string.
// A MassFigure argument (verb %M, or %.1M) is written in kg and also
// recorded with the text around it, so that a view can give it in pounds.
func (p *planner) find(code, level, subject, source, format string, args ...any) {
	p.marks = p.marks[:0]
	p.buf = appendMarked(p.buf[:0], &p.marks, format, args...)
	fd := Finding{
		Code: code, Level: level, Subject: subject, Source: source,
		Message: string(p.buf),
	}
	if len(p.marks) > 0 {
		// marks holds the start and end of each figure in the message.
		prev := 0
		for i := 0; i+1 < len(p.marks); i += 2 {
			fd.MassText = append(fd.MassText, fd.Message[prev:p.marks[i]])
			prev = p.marks[i+1]
		}
		fd.MassText = append(fd.MassText, fd.Message[prev:])
		for _, a := range args {
			if m, ok := a.(MassFigure); ok {
				fd.Masses = append(fd.Masses, m)
			}
		}
	}
	p.plan.Findings = append(p.plan.Findings, fd)
}

// appendf is the small subset of fmt the messages use: %g (float64 or
// int), %s, %d, %.0f, %.1f and %%. Unlike fmt it does not make its
// arguments escape, which keeps a plan's findings cheap to build.
func appendf(b []byte, format string, args ...any) []byte {
	return appendMarked(b, nil, format, args...)
}

// appendMarked is appendf that also writes a MassFigure (%M: "%g kg", or
// "%g–%g kg" for a range; %.1M with one decimal) and, when marks is not
// nil, appends the start and end offset in b of each one written.
func appendMarked(b []byte, marks *[]int, format string, args ...any) []byte {
	ai := 0
	next := func() any {
		if ai < len(args) {
			ai++
			return args[ai-1]
		}
		return "?"
	}
	for i := 0; i < len(format); i++ {
		c := format[i]
		if c != '%' || i+1 == len(format) {
			b = append(b, c)
			continue
		}
		i++
		prec := -1
		if format[i] == '.' && i+2 < len(format) {
			prec = int(format[i+1] - '0')
			i += 2
		}
		switch format[i] {
		case '%':
			b = append(b, '%')
		case 's':
			switch v := next().(type) {
			case string:
				b = append(b, v...)
			default:
				b = append(b, '?')
			}
		case 'd', 'g', 'f':
			switch v := next().(type) {
			case int:
				b = strconv.AppendInt(b, int64(v), 10)
			case float64:
				if format[i] == 'f' && prec >= 0 {
					b = strconv.AppendFloat(b, v, 'f', prec, 64)
				} else {
					b = strconv.AppendFloat(b, v, 'g', -1, 64)
				}
			default:
				b = append(b, '?')
			}
		case 'M':
			v, ok := next().(MassFigure)
			if !ok {
				b = append(b, '?')
				break
			}
			start := len(b)
			b = appendKg(b, v.Kg, prec)
			if v.MaxKg != 0 {
				b = append(b, "–"...)
				b = appendKg(b, v.MaxKg, prec)
			}
			b = append(b, " kg"...)
			if marks != nil {
				*marks = append(*marks, start, len(b))
			}
		default:
			b = append(b, '%', format[i])
		}
	}
	return b
}

// appendKg writes a figure as %g, or with prec decimals when prec ≥ 0.
func appendKg(b []byte, v float64, prec int) []byte {
	if prec >= 0 {
		return strconv.AppendFloat(b, v, 'f', prec, 64)
	}
	return strconv.AppendFloat(b, v, 'g', -1, 64)
}

// inRange reports lo ≤ v ≤ hi with a little slack for rounding.
func inRange(v, lo, hi float64) bool { return v >= lo-1e-9 && v <= hi+1e-9 }

// overrideWord labels a figure a dietitian set.
func overrideWord(overridden bool) string {
	if overridden {
		return " (a dietitian's override)"
	}
	return ""
}
