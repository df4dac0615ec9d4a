package main

import (
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/report"
)

// fluidChordTake renders the chord-role writing of chordRoleTake (C, F, G,
// C major; root, fifth, third, the root two octaves up) with fluidsynth
// from FluidR3 (Debian fluid-soundfont-gm), one part a file, each part
// bent by its own pitch bend (bends, cents), and mixes them as close
// microphones hear them (soxMix). General MIDI programs (0-based): 42
// cello, 71 clarinet, 73 flute.
func fluidChordTake(t *testing.T, bends [4]float64) (multi, mono string) {
	t.Helper()
	dir := t.TempDir()
	programs := []int{42, 71, 71, 73}
	roots := []int{48, 53, 43, 48} // C3 F3 G2 C3
	var dry []string
	for p, above := range []int{0, 7, 16, 24} {
		part := testsignal.MIDIPart{Program: programs[p], Cents: bends[p]}
		for i, r := range roots {
			part.Notes = append(part.Notes, testsignal.TimedNote{Key: r + above, Start: 0.2 + 1.5*float64(i), Seconds: 1.2})
		}
		name := filepath.Join(dir, "part"+strconv.Itoa(p))
		stereo := fluidWAV(t, testsignal.MIDIParts([]testsignal.MIDIPart{part}), "-ni", "-q", "-R", "0", "-C", "0", "-g", "0.5", "-r", "48000")
		soxTB(t, stereo, name+".wav", "remix", "1")
		dry = append(dry, name+".wav")
	}
	return soxMix(t, dir, dry)
}

// The same writing in real timbres: FluidR3's samples are tuned by ear, so
// the known truth is the difference between a render as the samples are
// tuned (equal temperament) and one whose fifth and third are bent to sit
// 2 ¢ narrow of 3/2 and 6 ¢ above 5/4 (bends −0.04 and −7.69 ¢: 699.96 − 700
// and 392.31 − 400, from the ratios; MIDI 1.0 14-bit bends over the default
// ±2 semitones, common practice). FluidSynth moves a note's pitch in steps
// of about a cent (measured: bends of 0.3, 0.6 and 0.9 ¢ moved a clarinet
// G4 by 0.04, 0.09 and 0.15 ¢, a bend of 1.2 ¢ by 1.03 ¢), so a render
// lies up to a cent from its bend: each player's role must move by its
// bend within 1.5 ¢, and the bent render's words say narrow fifths and sharp
// thirds. From the summed mono mixture (--voices) the chords' members are
// found, but which voice number a member gets wavers in these timbres, and
// a low cello root reads a few cents off in one chord: there the roles are
// pooled over the voices and must move within 2.5 ¢ (the one-microphone
// figure of TestVoicesOfRenderedProgression), and a chord whose top voice
// speaks late may count twice (before and after it enters); no one voice
// then has the three chords words need, so the pooled mean's sign is
// checked instead.
func TestReportOfRenderedChords(t *testing.T) {
	t.Parallel()
	bends := [4]float64{0, -0.04, -7.69, 0}
	plainMulti, plainMono := fluidChordTake(t, [4]float64{})
	bentMulti, bentMono := fluidChordTake(t, bends)
	roles := func(how ...string) string {
		log := filepath.Join(t.TempDir(), "j.csv")
		code, out, stderr := runLong(t, append([]string{"analyze", "--chords", "--log", log}, how...)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", how, code, stderr)
		}
		t.Logf("%v:\n%s", how[:2], out)
		code, rep, stderr := runCLI(t, "report", "--format", "json", log)
		if code != 0 {
			t.Fatalf("report: exit %d: %s", code, stderr)
		}
		return rep
	}
	for _, c := range []struct {
		name         string
		plain, bent  []string
		fifth, third string
		within       float64
	}{
		{"players", []string{"--players", "vc,vla,vl2,vl1", plainMulti}, []string{"--players", "vc,vla,vl2,vl1", bentMulti}, "vla", "vl2", 1.5},
		{"voices", []string{"--voices", "4", plainMono}, []string{"--voices", "4", bentMono}, "any", "any", 2.5},
	} {
		plain, bent := roles(c.plain...), roles(c.bent...)
		for _, w := range []struct {
			who, member, way string
			part             int
		}{{c.fifth, "fifth", "narrow", 1}, {c.third, "third", "above just (sharp)", 2}} {
			n0, m0, _ := roleOf(t, plain, w.who, w.member)
			n1, m1, words := roleOf(t, bent, w.who, w.member)
			want := testsignal.BendCents(bends[w.part]) - testsignal.BendCents(bends[0])
			t.Logf("%s: %s's %ss: %+.2f ¢ from just as rendered, %+.2f ¢ bent (%q): moved %+.2f ¢, bent %+.2f", c.name, w.who, w.member, m0, m1, words, m1-m0, want)
			chords := func(n int) bool { return n == 4 || w.who == "any" && n == 5 }
			if !chords(n0) || !chords(n1) || math.Abs(m1-m0-want) > c.within {
				t.Errorf("%s: %s's %ss moved %+.2f ¢ in %d and %d chords; bent %+.2f ¢ in 4", c.name, w.who, w.member, m1-m0, n0, n1, want)
			}
			if w.who == "any" {
				if way := (report.Role{Member: w.member, Mean: m1}).Sits(); !strings.Contains(way, w.way) {
					t.Errorf("%s: %ss pooled sit %s, want %q", c.name, w.member, way, w.way)
				}
			} else if !strings.Contains(words, w.way) {
				t.Errorf("%s: %s's %ss bent: %q, want %q", c.name, w.who, w.member, words, w.way)
			}
		}
	}
}
