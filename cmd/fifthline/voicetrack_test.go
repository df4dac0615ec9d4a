package main

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"fifthline/multipitch"
	"fifthline/target"
)

// A note heard an octave above a louder voice's note for at least half its
// length is that voice's octave — doubled, or its own even partials moving
// with a vibrato — and no voice of its own; a louder note an octave up, or
// one that outlasts the note below by more than its overlap, is a voice.
// Frames at the estimator's default hop and window at 44.1 kHz (4096 and
// 16384 samples); pitches in equal temperament from A4 = 440 Hz (ISO 16):
// G3 196.00 Hz, its octave G4 392.00 Hz.
func TestVoiceNoteAnOctaveAboveALouderOne(t *testing.T) {
	low, high := 196.0, 392.0
	for _, tc := range []struct {
		name   string
		voices []steadyVoice
		want   string
	}{
		{"quiet octave above throughout", []steadyVoice{{low, 0.1, 0, 2.5}, {high, 0.02, 0, 2.5}}, "G3"},
		{"quiet octave above for a while", []steadyVoice{{low, 0.1, 0, 2.5}, {high, 0.02, 0.5, 1.5}}, "G3"},
		{"louder octave above", []steadyVoice{{low, 0.02, 0, 2.5}, {high, 0.1, 0, 2.5}}, "G3 G4"},
		{"quiet octave outlasting the note below", []steadyVoice{{low, 0.1, 0, 1}, {high, 0.02, 0, 2.5}}, "G3 G4"},
	} {
		if got := trackedNotes(tc.voices); got != tc.want {
			t.Errorf("%s: heard %q, want %q", tc.name, got, tc.want)
		}
	}
}

// steadyVoice is a voice the estimator hears steadily from from to till seconds.
type steadyVoice struct {
	hz, amp    float64
	from, till float64 // seconds
}

// trackedNotes feeds the voice tracker 3 s of frames at the estimator's
// default hop and window at 44.1 kHz (4096 and 16384 samples) holding the
// voices sounding at each, and gives the notes it heard, spelled.
func trackedNotes(voices []steadyVoice) string {
	var notes []string
	hop, window := 4096/44100.0, 16384/44100.0
	tr := newTracker("test", fixed(target.Default()), hop, window, func(n voiceNote) { notes = append(notes, n.Reading.Note.String()) })
	for at := 0.0; at < 3; at += hop {
		var f multipitch.Frame
		f.Time = at
		for _, v := range voices {
			if at >= v.from && at < v.till {
				f.Voices = append(f.Voices, multipitch.Voice{Hz: v.hz, Amplitude: v.amp})
			}
		}
		tr.push(f)
	}
	tr.flush()
	return strings.Join(notes, " ")
}

// A voice's note is read in the tuning in force when it ends: the meter's
// keys may move A4 between two notes. A4 held at 440 Hz reads 0 ¢ at A4 =
// 440 Hz and 1200·log2(440/442) = −7.85 ¢ once A4 is 442 Hz (equal
// temperament, ISO 16; the cents formula is common practice).
func TestVoiceNotesFollowTheTuningInForce(t *testing.T) {
	hop, window := 4096/44100.0, 16384/44100.0
	now := 0.0
	tuning := func() target.Tuning {
		tu := target.Default()
		if now > 1.3 {
			tu.A4 = 442
		}
		return tu
	}
	var got []voiceNote
	tr := newTracker("test", tuning, hop, window, func(n voiceNote) { got = append(got, n) })
	for now = 0; now < 3; now += hop {
		f := multipitch.Frame{Time: now}
		if now < 1 || now >= 1.5 && now < 2.5 {
			f.Voices = []multipitch.Voice{{Hz: 440, Amplitude: 0.1}}
		}
		tr.push(f)
	}
	tr.flush()
	if len(got) != 2 {
		t.Fatalf("%d notes, want 2", len(got))
	}
	for i, want := range []struct{ a4, cents float64 }{{440, 0}, {442, -7.85}} {
		if n := got[i]; n.Tuning.A4 != want.a4 || math.Abs(n.Reading.Deviation-want.cents) > 0.01 {
			t.Errorf("note %d read %+.2f ¢ at A4 = %g Hz, want %+.2f ¢ at %g Hz", i+1, n.Reading.Deviation, n.Tuning.A4, want.cents, want.a4)
		}
	}
}

// A note most of whose frames the estimator marked as lying on a lower
// voice's partials (multipitch.Voice.OnPartials) is those partials: no
// note, and no voice in the numbering of the voices above it; one marked
// in fewer than half its frames is a voice, and so is one whose marked
// frames lie on average 15 ¢ or more from the partial (partialNoteCents).
// The group meter shows G4 where the tracker judges it a voice so far
// (tracker.partials): in its frames not marked, and in its marked ones
// once its track is long enough for a note (4 frames) and a voice by the
// same rule; before then a marked frame is left out.
// Frames as above; C3 130.81 Hz, G4 on its 3rd partial 392.44 Hz, E5
// 659.26 Hz (equal temperament, A4 = 440 Hz, ISO 16); G4 5 and 21 ¢ over
// that partial, 393.57 and 397.25 Hz (the cents formula, common practice).
func TestVoiceNoteOnALowerVoicesPartials(t *testing.T) {
	for _, tc := range []struct {
		name   string
		marked float64 // share of G4's frames marked
		g4     float64 // Hz
		want   string
		shown  int // of G4's 30 frames on the meter
	}{
		{"marked in most frames", 0.7, 392.44, "C3/1 E5/2", 9},
		{"marked in a few frames", 0.3, 392.44, "C3/1 G4/2 E5/3", 27},
		{"marked in most frames, 5 ¢ over the partial", 0.7, 393.57, "C3/1 E5/2", 9},
		{"marked in most frames, 21 ¢ over the partial", 0.7, 397.25, "C3/1 G4/2 E5/3", 27},
	} {
		shown := 0
		var notes []string
		hop, window := 4096/44100.0, 16384/44100.0
		tr := newTracker("test", fixed(target.Default()), hop, window, func(n voiceNote) {
			notes = append(notes, n.Reading.Note.String()+"/"+strconv.Itoa(n.voice))
		})
		for i := range 30 {
			vs := []multipitch.Voice{
				{Hz: 130.81, Amplitude: 0.1},
				{Hz: tc.g4, Amplitude: 0.05, OnPartials: float64(i%10) < 10*tc.marked},
				{Hz: 659.26, Amplitude: 0.05},
			}
			tr.push(multipitch.Frame{Time: float64(i) * hop, Voices: vs})
			if len(shownVoices(vs, tr.partials(vs))) == 3 {
				shown++
			}
		}
		tr.flush() // the notes in the order their tracks began
		if got := strings.Join(notes, " "); got != tc.want {
			t.Errorf("%s: heard %q, want %q", tc.name, got, tc.want)
		}
		if shown != tc.shown {
			t.Errorf("%s: the meter shows G4 in %d frames, want %d", tc.name, shown, tc.shown)
		}
	}
}

// A note an octave above a louder note that is itself a lower voice's
// partials (marked so in most of its frames) is not folded into it: it is
// a voice (a flute's B5 read also an octave low, as B4 on a trombone's E3's
// 3rd partial), though it ends first. E3 164.81, B4 494.43 and B5 988.86
// Hz (equal temperament, A4 = 440 Hz, ISO 16).
func TestVoiceNoteOctaveAboveAPartialIsAVoice(t *testing.T) {
	var notes []string
	hop, window := 4096/44100.0, 16384/44100.0
	tr := newTracker("test", fixed(target.Default()), hop, window, func(n voiceNote) {
		notes = append(notes, n.Reading.Note.String())
	})
	for i := range 40 {
		vs := []multipitch.Voice{{Hz: 164.81, Amplitude: 0.1}, {Hz: 494.43, Amplitude: 0.08, OnPartials: true}}
		if i < 12 { // B5 ends first, while B4 is still read
			vs = append(vs, multipitch.Voice{Hz: 988.86, Amplitude: 0.05})
		}
		tr.push(multipitch.Frame{Time: float64(i) * hop, Voices: vs})
	}
	tr.flush()
	if got := strings.Join(notes, " "); got != "B5 E3" { // in the order they end
		t.Errorf("heard %q, want \"B5 E3\"", got)
	}
}

// A voice held long as a voice, marked in one frame as the partial of a
// voice read there for the first time (a sawtooth chord's release read an
// octave low: C4 as C3, G4 on its 3rd partial; measured with sox's C4 E4
// G4 of TestListenVoicesGroupMeterInTmux), is judged by that frame alone:
// the meter leaves it out of the frame, as it did every marked frame. C4
// 261.63, C3 130.81, E4 329.63, G4 392.00 Hz (equal temperament, A4 = 440
// Hz, ISO 16).
func TestMeterJudgesAVoiceOnAPassingReadingsPartialByItsFrame(t *testing.T) {
	hop, window := 4096/44100.0, 16384/44100.0
	tr := newTracker("test", fixed(target.Default()), hop, window, func(voiceNote) {})
	for i := range 20 {
		tr.push(multipitch.Frame{Time: float64(i) * hop, Voices: []multipitch.Voice{{Hz: 261.63, Amplitude: 0.1}, {Hz: 329.63, Amplitude: 0.1}, {Hz: 392, Amplitude: 0.1}}})
	}
	release := []multipitch.Voice{{Hz: 130.81, Amplitude: 0.05}, {Hz: 329.63, Amplitude: 0.05}, {Hz: 392, Amplitude: 0.05, OnPartials: true}}
	tr.push(multipitch.Frame{Time: 20 * hop, Voices: release})
	if got := tr.partials(release); !got[2] || got[0] || got[1] {
		t.Errorf("the release frame's voices taken for partials: %v, want only G4's", got)
	}
}

// A note is a lower voice's partial when most of the frames whose envelope
// could be read were marked so; frames that could not be read count
// neither way (the counts are those measured on voices_untuned_test.go's
// three quick chords for the oboe's B4's 3rd partial read as F#6: 13
// frames, 6 marked, 7 unjudged, its marked frames 2.4 ¢ off the partial on
// average).
func TestNoteOnPartialsJudgedOnFramesThatCouldBeRead(t *testing.T) {
	for _, tc := range []struct {
		name                     string
		count, partial, unjudged int
		want                     bool
	}{
		{"marked in every frame judged", 13, 6, 7, true},
		{"marked in half the frames, all judged", 13, 6, 0, false},
		{"marked in most frames, all judged", 13, 7, 0, true},
		{"no frame judged", 13, 0, 13, false},
	} {
		tr := &track{count: tc.count, partial: tc.partial, unjudged: tc.unjudged, partialCents: 2.4 * float64(tc.partial)}
		if got := tr.onPartials(); got != tc.want {
			t.Errorf("%s: onPartials %v, want %v", tc.name, got, tc.want)
		}
	}
}
