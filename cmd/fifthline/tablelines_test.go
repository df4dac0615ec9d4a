package main

import (
	"strings"
	"testing"
)

// analyze --voices --format table ends, as --players does, with the take's
// group-drift line (docs/interface.md, "Additions of this repository"): a
// just chord's thirds, 13.7 ¢ off equal temperament (386.31 − 400 ¢, from the
// definitions), are the chord's tuning, not the take's drift. sox's chord is
// C4, a just E4 (327.0375 = 261.63·5/4) and G4 (392.445 = 261.63·3/2).
func TestAnalyzeVoicesTableEndsWithTheGroupsDrift(t *testing.T) {
	path := sox(t, "chord.wav", "-r", "44100", "-b", "16", "synth 2 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8")
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--format", "table", path)
	lines := strings.Split(strings.TrimRight(out, "\n"), "\n")
	if last := lines[len(lines)-1]; code != 0 || !strings.HasPrefix(last, path+": group drift ") || !strings.Contains(last, "thirds 0.0 ¢") {
		t.Errorf("exit %d (%s), last line %q, want the group's drift with thirds 0.0 ¢ from just:\n%s", code, stderr, last, out)
	}
	code, out, _ = runCLI(t, "analyze", "--voices", "auto", "--format", "csv", path)
	if code != 0 || strings.Contains(out, "group drift") {
		t.Errorf("the CSV carries no such line:\n%s", out)
	}
}
