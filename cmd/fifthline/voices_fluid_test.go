package main

import (
	"math"
	"os/exec"
	"testing"

	"fifthline/internal/testsignal"
)

// A chord progression of our own, rendered by fluidsynth from FluidR3
// (Debian fluid-soundfont-gm) with each part on its own MIDI channel, all
// mixed onto one channel, twice: once as the samples are tuned, once with
// the upper parts pitch-bent to just intonation above the root (third
// −13.69 ¢, fifth +1.96 ¢ from equal: 386.31 − 400 and 701.96 − 700 ¢,
// from the ratios; bends to 0.0122 ¢, 14-bit MIDI values). FluidR3's
// samples are tuned by ear and its loops wander, but the same samples wander
// the same way in both renders (reverb and chorus off), so the known truth
// is the difference: each member must move by its bend within 2 ¢ and its
// just reading by its bend against the root's within 3 ¢ (the issue's
// figures; the cello's own wander over a note that starts later in one
// render than the other costs about a cent). Each chord must be named and
// its members spelled.
func TestVoicesOfRenderedProgression(t *testing.T) {
	t.Parallel()
	if _, err := exec.LookPath("fluidsynth"); err != nil {
		t.Fatalf("fluidsynth not found (make test installs it): %v", err)
	}
	// C major (C3 G3 E4), then A major (A2 E3 C♯4): root, fifth, third.
	// General MIDI programs (0-based): 42 cello, 71 clarinet ×2. (FluidR3's
	// viola sample carries a vibrato of about ±10 ¢ as the estimator reads
	// it; in this voicing a frame or two lose it: see the report.)
	parts := []testsignal.MIDIPart{
		{Program: 42, Notes: []testsignal.TimedNote{{Key: 48, Start: 0, Seconds: 2}, {Key: 45, Start: 2.5, Seconds: 2}}},
		{Program: 71, Notes: []testsignal.TimedNote{{Key: 55, Start: 0, Seconds: 2}, {Key: 52, Start: 2.5, Seconds: 2}}},
		{Program: 71, Notes: []testsignal.TimedNote{{Key: 64, Start: 0, Seconds: 2}, {Key: 61, Start: 2.5, Seconds: 2}}},
	}
	bends := []float64{0, 1.96, -13.69}
	dir := t.TempDir()
	read := func(name string) map[string]map[string]string {
		wav := renderMIDI(t, dir, name, testsignal.MIDIParts(parts))
		code, out, stderr := runLong(t, "analyze", "--voices", "3", "--chords", wav)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		_, rows := readCSV(t, out)
		// A voice entering late makes a passing chord of the others
		// first (a bowed A2 speaks slowly under the clarinet's E3):
		// logged, not read here.
		byMember := map[string]map[string]string{}
		for _, r := range rows {
			if r["chord"] == "C major" || r["chord"] == "A major" {
				byMember[r["chord"]+" "+r["member"]] = r
			}
		}
		if len(byMember) != 6 || len(rows) > 8 {
			t.Fatalf("%s: want the 6 members of two chords:\n%s", name, out)
		}
		t.Logf("%s:\n%s", name, out)
		return byMember
	}
	plain := read("plain")
	for p := range parts {
		parts[p].Cents = bends[p]
	}
	bent := read("bent")
	for _, c := range []struct {
		chord string
		notes [3]string // root, fifth, third: the parts' order
	}{{"C major", [3]string{"C3", "G3", "E4"}}, {"A major", [3]string{"A2", "E3", "C#4"}}} {
		for p, member := range []string{"root", "fifth", "third"} {
			a, b := plain[c.chord+" "+member], bent[c.chord+" "+member]
			if a == nil || b == nil || b["note"] != c.notes[p] {
				t.Errorf("%s %s: plain %v, bent %v, want %s", c.chord, member, a, b, c.notes[p])
				continue
			}
			moved := 1200 * math.Log2(num(b, "hz")/num(a, "hz"))
			justMoved := num(b, "just_cents") - num(a, "just_cents")
			want, wantJust := testsignal.BendCents(bends[p]), testsignal.BendCents(bends[p])-testsignal.BendCents(bends[0])
			if math.Abs(moved-want) > 2 || math.Abs(justMoved-wantJust) > 3 {
				t.Errorf("%s %s %s: moved %+.3f ¢ (bend %+.3f), just reading moved %+.3f ¢ (want %+.3f)", c.chord, member, c.notes[p], moved, want, justMoved, wantJust)
			} else {
				t.Logf("%s %s %s: moved %+.3f ¢ (bend %+.3f); just %+.2f ¢ bent", c.chord, member, c.notes[p], moved, want, num(b, "just_cents"))
			}
		}
	}
}
