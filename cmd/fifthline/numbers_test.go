package main

import (
	"strings"
	"testing"
)

// A reading that rounds to nothing is "0.00", never "-0.00", in the frame
// track as in the note rows (a spreadsheet sorts "-0.00" below zero, and a
// musician reads it as flat). sox's 440 Hz sine is A4 exactly at A4 = 440 Hz
// (ISO 16), so its frames round to 0.00 ¢ either side of zero.
func TestFrameCentsNeverNegativeZero(t *testing.T) {
	path := sox(t, "a4.wav", "-r", "44100", "-b", "24", "synth 0.8 sine 440 pad 0.2 0.3")
	for _, format := range []string{"csv", "table", "json"} {
		code, out, stderr := runCLI(t, "analyze", "--frames", "--format", format, path)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		if !strings.Contains(out, "0.00") || strings.Contains(out, "-0.00") {
			t.Errorf("--format %s: want 0.00 and no -0.00:\n%s", format, out)
		}
	}
}
