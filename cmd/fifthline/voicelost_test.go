package main

import (
	"fmt"
	"strings"
	"testing"

	"fifthline/multipitch"
	"fifthline/target"
)

// A voice missing from the frames for under lostSeconds while the chord
// around it holds, found again at its pitch, sings on: one note, not two
// pieces and the gap. Lost longer, found again elsewhere, or with the chord
// changed meanwhile, its note ended where it was lost. A reading heard in
// too few frames (a partial passing in and out of the frames) is not
// waited for. Frames at the estimator's default hop and window at
// 44.1 kHz (4096 and 16384 samples); F major seventh in equal temperament
// from A4 = 440 Hz (ISO 16): F3 174.61, C4 261.63, E4 329.63, A4 440.00 Hz.
func TestTrackerHoldsAVoiceLostUnderAHeldChord(t *testing.T) {
	type voice struct {
		hz, amp    float64
		from, till float64 // seconds
		every      int     // heard in one frame of every; 0: every frame
	}
	f3, c4, e4, a4 := 174.61, 261.63, 329.63, 440.00
	upper := []voice{{c4, 0.1, 0, 2.5, 0}, {e4, 0.1, 0, 2.5, 0}, {a4, 0.1, 0, 2.5, 0}}
	chord := func(vs ...voice) []voice { return append(vs, upper...) }
	for _, tc := range []struct {
		name   string
		voices []voice
		want   string // F3's notes and what else is heard
	}{
		{"held throughout", chord(voice{f3, 0.1, 0, 2.5, 0}), "F3 0.0-2.4, C4 E4 A4"},
		{"lost for 0.46 s", chord(voice{f3, 0.1, 0, 1, 0}, voice{f3, 0.1, 1.46, 2.5, 0}), "F3 0.0-2.4, C4 E4 A4"},
		{"lost for 1.2 s", chord(voice{f3, 0.1, 0, 0.8, 0}, voice{f3, 0.1, 2.0, 2.5, 0}), "F3 0.0-0.7 F3 2.0-2.4, C4 E4 A4"},
		// 30 ¢ sharp of 174.61 Hz: 174.61·2^(30/1200).
		{"found again 30 ¢ off", chord(voice{f3, 0.1, 0, 1, 0}, voice{177.66, 0.1, 1.46, 2.5, 0}), "F3 0.0-0.9 F3 1.5-2.4, C4 E4 A4"},
		// C4 to D4, 293.66 Hz, in the gap.
		{"the chord moved meanwhile", []voice{{f3, 0.1, 0, 1, 0}, {f3, 0.1, 1.46, 2.5, 0}, {c4, 0.1, 0, 1.1, 0}, {293.66, 0.1, 1.1, 2.5, 0}, {e4, 0.1, 0, 2.5, 0}, {a4, 0.1, 0, 2.5, 0}},
			"F3 0.0-0.9 F3 1.5-2.4, C4 E4 A4 D4"},
		// E4's 3rd partial, 988.9 Hz, read as B5 in one frame of four.
		{"a partial passing in and out", chord(voice{f3, 0.1, 0, 2.5, 0}, voice{988.9, 0.02, 0, 2.5, 4}), "F3 0.0-2.4, C4 E4 A4"},
	} {
		var f3s, others []string
		hop, window := 4096/44100.0, 16384/44100.0
		tr := newTracker("test", fixed(target.Default()), hop, window, func(n voiceNote) {
			if name := n.Reading.Note.String(); name == "F3" {
				f3s = append(f3s, fmt.Sprintf("F3 %.1f-%.1f", n.Start, n.End))
			} else {
				others = append(others, name)
			}
		})
		for i, at := 0, 0.0; at < 3; i, at = i+1, at+hop {
			f := multipitch.Frame{Time: at}
			for _, v := range tc.voices {
				if at >= v.from && at < v.till && (v.every == 0 || i%v.every == 0) {
					f.Voices = append(f.Voices, multipitch.Voice{Hz: v.hz, Amplitude: v.amp})
				}
			}
			tr.push(f)
		}
		tr.flush()
		if got := strings.Join(f3s, " ") + ", " + strings.Join(others, " "); got != tc.want {
			t.Errorf("%s: heard %q, want %q", tc.name, got, tc.want)
		}
	}
}

// Notes are given out in the order they end: a voice falling silent a
// little before the rest of its chord is held as lost meanwhile, and its
// note, ended where it was lost, still comes first (listen prints notes as
// they end). The chord of TestTrackerHoldsAVoiceLostUnderAHeldChord, F3
// silent from 2.2 s, the others from 2.5 s.
func TestLostVoiceKeepsTheOrderNotesEnd(t *testing.T) {
	hop, window := 4096/44100.0, 16384/44100.0
	var got []string
	tr := newTracker("test", fixed(target.Default()), hop, window, func(n voiceNote) {
		got = append(got, fmt.Sprintf("%s %.1f", n.Reading.Note, n.End))
	})
	for at := 0.0; at < 3; at += hop {
		f := multipitch.Frame{Time: at}
		for _, hz := range []float64{174.61, 261.63, 329.63, 440.00} {
			if at < 2.5 && (hz != 174.61 || at < 2.2) {
				f.Voices = append(f.Voices, multipitch.Voice{Hz: hz, Amplitude: 0.1})
			}
		}
		tr.push(f)
	}
	tr.flush()
	if s := strings.Join(got, ", "); s != "F3 2.1, C4 2.4, E4 2.4, A4 2.4" {
		t.Errorf("notes given out as %q, want F3 first", s)
	}
}
