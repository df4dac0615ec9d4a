package target

import "strconv"

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
