package main

import (
	"strings"
	"testing"
)

// Candidates are pruned by the key's spelling window and the declared
// chord. sox sums sawtooths onto one channel: equal-tempered C4 E4 G4
// (261.63, 329.63, 392.00 Hz; ISO 16, common practice) and a fourth voice.
func TestVoicesPrunedByKeyAndChord(t *testing.T) {
	t.Parallel()
	notes := func(out string) string {
		_, rows := readCSV(t, out)
		return strings.Join(column(rows, "note"), " ")
	}
	// A4 (440 Hz) over the triad is a fourth voice of C major; declared
	// as the chord C major, only the chord's members are voices, and A4's
	// partials (E5 and E6 among them) are taken for none.
	path, out := soxVoices(t, "synth 2 sawtooth 261.63 sawtooth 329.63 sawtooth 392 sawtooth 440 remix 1,2,3,4 gain -10")
	if got := notes(out); got != "C4 E4 G4 A4" {
		t.Errorf("C4 E4 G4 A4 in C major: heard %q\n%s", got, out)
	}
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--chord", "C major", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if got := notes(out); got != "C4 E4 G4" {
		t.Errorf("the same under --chord \"C major\": heard %q\n%s", got, out)
	}
	// A voice a quarter tone above A4 (440 · 2^(50/1200) = 452.89 Hz, 50 ¢
	// from A4 and from B♭4 in equal temperament) is between the key's
	// notes: no voice of the key, not reported, and its partials taken for
	// none.
	_, out = soxVoices(t, "synth 2 sawtooth 261.63 sawtooth 329.63 sawtooth 392 sawtooth 452.89 remix 1,2,3,4 gain -10")
	if got := notes(out); got != "C4 E4 G4" {
		t.Errorf("C4 E4 G4 and a quarter tone: heard %q\n%s", got, out)
	}
}
