package main

import (
	"testing"
)

// The woodwind quartet's A minor (A2 E4 C5 A5 from 3 s; voices_untuned_test.go)
// read with --voices 3: the flute's A5 is read an octave low, as A4, at its
// attack (3.07 to 3.25 s) and in frames where A5 itself reads weak (3.53,
// 4.55, 4.64 s). Read whole, A4 lies on the bassoon's A2's 4th harmonic,
// so its voice, missing from 3.62 s, is not held as lost (voicelost.go: a
// lower voice's partial, maybe); capped to three, A2, the quietest, was
// left out of those frames, so A4 was held through the 0.93 s without it,
// its note lasted 3.07 to 4.64 s, A5's note was folded into it as its
// octave, and the chord rows read "A minor" with A4 for its root from 3.53
// to 4.64 s, then "C major" (E4 C5) to 5.48 s. A voice the cap leaves out
// still sounds beneath: it is weighed as in the whole frame. General MIDI
// programs and chord names: common practice; A5 880 Hz, A4 440 Hz (ISO
// 16), the flute bent +12 ¢.
func TestVoicesCapKeepsTheFlutesA5OverItsOctaveLowReading(t *testing.T) {
	t.Parallel()
	sc := untunedScene(t, "woodwind quartet: bassoon, clarinet, oboe, flute")
	mix := sceneMix(t, sc)
	code, out, stderr := runLong(t, append([]string{"analyze", "--voices", "3", "--chords"}, append(sc.musical(), mix)...)...)
	if code != 0 {
		t.Fatalf("--voices 3 --chords: exit %d: %s", code, stderr)
	}
	t.Logf("--voices 3 --chords:\n%s", out)
	_, rows := readCSV(t, out)
	members := map[string]string{}
	for _, r := range rows {
		if num(r, "start_s") <= 4.25 && 4.25 <= num(r, "end_s") {
			if r["chord"] != "A minor" {
				t.Errorf("at 4.25 s: %s, want A minor", r["chord"])
			}
			members[r["member"]] = r["note"]
		}
		if r["note"] == "A4" {
			t.Errorf("a row reads the flute's A5 an octave low: %v", r)
		}
	}
	if members["root"] != "A5" || members["third"] != "C5" || members["fifth"] != "E4" {
		t.Errorf("the A minor at 4.25 s has members %v, want root A5 (the flute), third C5, fifth E4", members)
	}
}
