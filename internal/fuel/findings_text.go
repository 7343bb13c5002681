package fuel

import (
	"strconv"
)

// How a finding is recorded and its message written, cheaply: the planner
// makes dozens of findings per plan.

// find records a finding. The message is formatted by appendf into a
// buffer reused across findings, so each finding costs one string.
func (p *planner) find(code, level, subject, source, format string, args ...any) {
	p.buf = appendf(p.buf[:0], format, args...)
	p.plan.Findings = append(p.plan.Findings, Finding{
		Code: code, Level: level, Subject: subject, Source: source,
		Message: string(p.buf),
	})
}

// appendf is the small subset of fmt the messages use: %g (float64 or
// int), %s, %d, %.0f, %.1f and %%. Unlike fmt it does not make its
// arguments escape, which keeps a plan's findings cheap to build.
func appendf(b []byte, format string, args ...any) []byte {
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
		default:
			b = append(b, '%', format[i])
		}
	}
	return b
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
