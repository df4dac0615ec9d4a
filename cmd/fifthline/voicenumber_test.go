package main

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"fifthline/multipitch"
	"fifthline/target"
)

// The contract numbers a voice's notes 1 = the lowest sounding at the
// note's start, up to N ≤ 4 voices. A voice whose note ends as its next
// one begins counts once, a note ending at the start still sounds then, and
// however many notes overlap, no number passes --voices N (4 with auto).
func TestVoiceNumberCountsEachVoiceOnceAndStopsAtN(t *testing.T) {
	inf := math.Inf(1)
	for _, tc := range []struct {
		name  string
		most  int
		below []span
		want  int
	}{
		{"alone", 0, nil, 1},
		{"over a held bass", 0, []span{{0, inf}}, 2},
		{"a bass ending at the start still sounds then", 0, []span{{0, 1}}, 2},
		{"a bass ended before the start", 0, []span{{0, 0.9}}, 1},
		{"over a bass whose next note begins a hop later", 0, []span{{0, 1.05}, {1.1, inf}}, 2},
		{"over a voice struck a hop later", 0, []span{{0, inf}, {1.1, inf}}, 3},
		{"over four notes at once", 0, []span{{0, inf}, {0, inf}, {0.5, inf}, {1, inf}}, 4},
		{"over two notes with --voices 2", 2, []span{{0, inf}, {0, inf}}, 2},
	} {
		tr := &tracker{most: tc.most}
		if got := tr.numbered(tc.below, 1, 0.2); got != tc.want {
			t.Errorf("%s: voice %d, want %d", tc.name, got, tc.want)
		}
	}
}

// Five steady notes the tracker is handed at once (more than one channel's
// estimator gives, as a voice held lost under a chord adds one) are
// numbered 1 to 4, the top two both 4: no "voice 5". Pitches: a C major
// chord in equal temperament from A4 = 440 Hz (ISO 16), C3 E3 G3 C4 E4.
func TestVoiceNumbersOfFiveNotesStopAtFour(t *testing.T) {
	hop, window := 4096/44100.0, 16384/44100.0
	var got []string
	tr := newTracker("test", fixed(target.Default()), hop, window, func(n voiceNote) {
		got = append(got, n.Reading.Note.String()+":"+strconv.Itoa(n.voice))
	})
	for at := 0.0; at < 2; at += hop {
		f := multipitch.Frame{Time: at}
		for _, hz := range []float64{130.81, 164.81, 196.00, 261.63, 329.63} {
			f.Voices = append(f.Voices, multipitch.Voice{Hz: hz, Amplitude: 0.1})
		}
		tr.push(f)
	}
	tr.flush()
	heardNotes := strings.Join(got, " ")
	for _, want := range []string{"C3:1", "E3:2", "G3:3", "C4:4", "E4:4"} {
		if !strings.Contains(heardNotes, want) {
			t.Errorf("heard %q, want %s among them", heardNotes, want)
		}
	}
}

// stringQuartetHeldF4 is a string quartet of our own in Werckmeister III
// at A4 = 440 Hz (temperedProgression: FluidR3's cello, viola and two
// violins, each key tuned through the MIDI Tuning Standard to the
// temperament's published definition, werckmeister3), summed onto one
// channel at 40 dB SNR: C major (C3 G3 E4 C5), F major (F3 C4 F4 A4), B♭
// major (B♭2 D4 F4 B♭4), C major; the second violin holds F4 through the
// middle two, F3's octave in the first. It gives the take and the score's
// notes.
func stringQuartetHeldF4(t *testing.T) (string, map[string]bool) {
	rows := [][]string{{"C3", "G3", "E4", "C5"}, {"F3", "C4", "F4", "A4"}, {"Bb2", "D4", "F4", "Bb4"}, {"C3", "G3", "E4", "C5"}}
	parts, names := temperedProgression(t, temperament(werckmeister3), 440, []int{42, 41, 40, 40}, rows...)
	score := map[string]bool{}
	for _, r := range rows {
		for _, n := range r {
			score[n] = true
		}
	}
	return sceneMix(t, scene{parts: parts, names: names, snr: 40}), score
}

// The quartet read by analyze --voices auto and heard live by listen
// --plain --voices auto through a private one-channel null sink: every
// row's voice is 1 to 4 both ways (live, a phantom C6 over the F major's
// four notes was "voice 5" before), and a note of the score heard both
// ways, at the same start (within 0.25 s, once the live clock is set to
// the file's by the first note), has the same voice.
func TestVoiceNumbersLiveAsOffline(t *testing.T) {
	t.Parallel()
	wav, score := stringQuartetHeldF4(t)
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--key", "F major", "--temperament", "Werckmeister III", wav)
	if code != 0 {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	_, offline := readCSV(t, out)
	live := voicesHeardLive(t, wav)
	_, heard := readCSV(t, live)
	for _, rows := range [][]map[string]string{offline, heard} {
		for _, r := range rows {
			if v, err := strconv.Atoi(r["voice"]); err != nil || v < 1 || v > 4 {
				t.Errorf("%s at %s s: voice %q, want 1 to 4", r["note"], r["start_s"], r["voice"])
			}
		}
	}
	if len(offline) == 0 || len(heard) == 0 {
		t.Fatalf("no notes: offline\n%s\nlive\n%s", out, live)
	}
	start := func(r map[string]string) float64 { s, _ := strconv.ParseFloat(r["start_s"], 64); return s }
	first := func(rows []map[string]string) float64 {
		m := math.Inf(1)
		for _, r := range rows {
			m = min(m, start(r))
		}
		return m
	}
	shift, matched := first(heard)-first(offline), 0
	for _, o := range offline {
		for _, l := range heard {
			if !score[o["note"]] || l["note"] != o["note"] || math.Abs(start(l)-shift-start(o)) > 0.25 {
				continue
			}
			matched++
			if l["voice"] != o["voice"] {
				t.Errorf("%s at %s s: voice %s live, %s offline", o["note"], o["start_s"], l["voice"], o["voice"])
			}
		}
	}
	if matched < 8 {
		t.Errorf("%d notes of the score heard both ways, want 8 or more:\noffline\n%s\nlive\n%s", matched, out, live)
	}
}
