package main

import (
	"math"
	"path/filepath"
	"slices"
	"testing"

	"fifthline/harmony"
	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// A voice the estimator loses for a moment under a chord that holds sings
// on: the chord is one row, its member read over both pieces' frames. A
// voice silent for longer than lostSeconds, or found again after the chord
// around it changed, starts a chord row of its own. C3 in equal temperament
// from A4 = 440 Hz (ISO 16: 440·2^(−21/12)); E4 and G4 its just tenth and
// twelfth (5/2, 3: common practice), A2 110 Hz and its just twelfth E4 330
// Hz.
func TestAVoiceLostUnderAHeldChord(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	note := func(voice int, hz, from, to float64) voiceNote {
		tr := &harmony.Track{}
		for at := from; at <= to; at += 0.01 {
			tr.Add(at, hz)
		}
		return voiceNote{Event: session.Event{Held: pitchdetect.Held{Start: from, End: to, Hz: hz}, Reading: tu.Classify(hz)}, voice: voice, frames: tr}
	}
	for _, tc := range []struct {
		name   string
		notes  []voiceNote
		starts []float64 // the chord rows' starts (C3 and G4 alone: C open fifth)
	}{
		{"lost for 0.6 s", []voiceNote{note(1, c3, 0, 3), note(2, c3*5/2, 0, 1.2), note(3, c3*3, 0, 3), note(2, c3*5/2, 1.8, 3)}, []float64{0}},
		// G4's gap is bridged once E4's is, around it.
		{"two lost in turn", []voiceNote{note(1, c3, 0, 3), note(3, c3*3, 0, 1), note(3, c3*3, 1.3, 3), note(2, c3*5/2, 0, 1.2), note(2, c3*5/2, 1.5, 3)}, []float64{0}},
		{"silent for 1.2 s", []voiceNote{note(1, c3, 0, 3.4), note(2, c3*5/2, 0, 1), note(3, c3*3, 0, 3.4), note(2, c3*5/2, 2.2, 3.4)}, []float64{0, 1, 2.2}},
		{"the chord changed meanwhile", []voiceNote{note(1, c3, 0, 1.5), note(2, c3*5/2, 0, 1.2), note(1, 110, 1.5, 3), note(2, 330, 1.8, 3)}, []float64{0, 1.8}},
	} {
		chords := chordsOf(tc.notes, tu, target.DefaultSeventh)
		var starts []float64
		for _, c := range chords {
			starts = append(starts, c.Start)
			for i, m := range c.Members {
				if n := tc.notes[c.Notes[i]]; n.Reading.Note != m.Note || math.Abs(m.JustCents) > 0.01 {
					t.Errorf("%s: %s member %d is %s %+.2f ¢ from just, from note %s: want its own note, just", tc.name, c.Name(), i, m.Note, m.JustCents, n.Reading.Note)
				}
			}
		}
		if !slices.Equal(starts, tc.starts) {
			t.Errorf("%s: chord rows starting at %v, want %v", tc.name, starts, tc.starts)
		}
	}
}

// A chord member's reading leaves out its attack's scoop, on one
// microphone as on a player's own channel (harmony.Note.Settled). C4 in
// equal temperament from A4 = 440 Hz (ISO 16) and G4 its just fifth hold
// from 0.3 s to 3 s; E5, their just tenth (3/2, 5/2: common practice),
// enters on them at 1 s and scoops up from 40 ¢ flat over its first
// 0.3 s (a raised-cosine glide, as a singer or a brass player may come in
// from below). Additive sawtooth-like voices (partial k at 1/k). The truth
// is exact: the tenth's just reading is 0 ¢, and the same chord with E5
// entering steady reads it so. analyze --voices auto --chords reads the
// C major's third within 0.3 ¢ of both (the scooped one read -0.63 ¢ when
// the chord read a voice from the chord's start; now 0.00 ¢).
func TestAScoopedVoiceIsReadFromWhereItSettles(t *testing.T) {
	t.Parallel()
	const rate = 48000.0
	c4 := 440 * math.Exp2(-9.0/12)
	saw := testsignal.Spectrum{Name: "sawtooth-like", Amps: []float64{1, 1.0 / 2, 1.0 / 3, 1.0 / 4, 1.0 / 5, 1.0 / 6, 1.0 / 7, 1.0 / 8}}
	scoop := func(hz float64) func(float64) float64 {
		return func(t float64) float64 {
			if t >= 0.3 {
				return hz
			}
			return hz * math.Exp2(-40*(0.5+0.5*math.Cos(math.Pi*t/0.3))/1200)
		}
	}
	type voice struct {
		from, to float64
		hz       func(float64) float64
	}
	dir := t.TempDir()
	thirds := map[string]float64{}
	for _, tc := range []struct {
		name string
		top  func(float64) float64
	}{{"steady", testsignal.Steady(c4 * 5 / 2)}, {"scooped", scoop(c4 * 5 / 2)}} {
		x := make([]float64, int(3.3*rate))
		for _, v := range []voice{{0.3, 3, testsignal.Steady(c4)}, {0.3, 3, testsignal.Steady(c4 * 3 / 2)}, {1, 3, tc.top}} {
			y := testsignal.Tone(rate, int((v.to-v.from)*rate), saw, 0.1, v.hz)
			testsignal.FadeIn(y, rate, 0.02)
			testsignal.FadeOut(y, rate, 0.02)
			for i, s := range y {
				x[int(v.from*rate)+i] += s
			}
		}
		path := monoWAV(t, filepath.Join(dir, tc.name), x)
		code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--chords", path)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tc.name, code, stderr)
		}
		_, rows := readCSV(t, out)
		for _, r := range rows {
			if r["chord"] == "C major" && r["member"] == "third" {
				thirds[tc.name] = parseF(r["just_cents"])
			}
		}
		t.Logf("%s:\n%s", tc.name, out)
		if _, ok := thirds[tc.name]; !ok {
			t.Fatalf("%s: no C major with its third:\n%s", tc.name, out)
		}
	}
	if s, g := thirds["scooped"], thirds["steady"]; math.Abs(s) > 0.3 || math.Abs(s-g) > 0.3 {
		t.Errorf("the scooped third reads %+.2f ¢ from just, steady %+.2f ¢: want both 0 ± 0.3 ¢", s, g)
	}
}
