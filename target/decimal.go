package target

import (
	"strconv"
	"strings"
	"time"
)

// Decimal formats x with the given decimals, never as "-0.0": a reading
// that rounds to nothing has no sign. It is the one formatter of numbers
// for CSV, tables and the screen alike.
func Decimal(x float64, decimals int) string {
	s := strconv.FormatFloat(x, 'f', decimals, 64)
	if s[0] == '-' {
		if z, err := strconv.ParseFloat(s, 64); err == nil && z == 0 {
			return s[1:]
		}
	}
	return s
}

// Signed is Decimal with a plus sign before a positive value: "+6.1",
// "-3.0", and "0.0" for what rounds to nothing.
func Signed(x float64, decimals int) string {
	s := Decimal(x, decimals)
	if s[0] != '-' {
		if z, _ := strconv.ParseFloat(s, 64); z != 0 {
			return "+" + s
		}
	}
	return s
}

// Span formats a duration the way takes and rehearsals are timed: "2.5 s"
// (a held chord: whole seconds would say 2 for 2.5), "45 s", "80 s",
// "1 min", "40 min", "1.5 h", "14 days".
func Span(d time.Duration) string {
	switch {
	case d < 10*time.Second:
		return strings.TrimSuffix(Decimal(d.Seconds(), 1), ".0") + " s"
	case d < 90*time.Second && d%time.Minute != 0:
		return Decimal(d.Seconds(), 0) + " s"
	case d < 90*time.Minute:
		return Decimal(d.Minutes(), 0) + " min"
	case d < 48*time.Hour:
		return strings.TrimSuffix(Decimal(d.Hours(), 1), ".0") + " h"
	}
	return Decimal(d.Hours()/24, 0) + " days"
}
