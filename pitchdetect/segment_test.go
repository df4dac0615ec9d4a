package pitchdetect

import (
	"math"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

// Vibrato of 5–25 cents peak to peak at 4.5–6.5 Hz: the range of sung and
// bowed vibrato (common practice). The signal's log-frequency is a sine about
// the centre, so the mean over whole cycles is exactly the centre.
func TestVibratoCentreWidthAndRate(t *testing.T) {
	rate := 44100.0
	for _, s := range []testsignal.Spectrum{testsignal.Saw, testsignal.OddOnly, testsignal.WeakFund} {
		for _, width := range []float64{5, 15, 25} {
			for _, vr := range []float64{4.5, 5.5, 6.5} {
				hz := 392.0 // G4
				x := testsignal.Tone(rate, int(rate*1.6), s, 0.5, testsignal.Vibrato(hz, width, vr))
				notes := segment(run(t, rate, x), rate)
				if len(notes) != 1 {
					t.Errorf("%s %g ¢ at %g Hz: %d notes, want 1", s.Name, width, vr, len(notes))
					continue
				}
				n := notes[0]
				if c := testsignal.Cents(n.Hz, hz); math.Abs(c) > 0.5 ||
					math.Abs(n.VibratoRate-vr) > 0.15 || math.Abs(n.VibratoWidth-width) > 0.15*width {
					t.Errorf("%s %g ¢ at %g Hz: centre %+.3f ¢, width %.2f ¢, rate %.2f Hz",
						s.Name, width, vr, c, n.VibratoWidth, n.VibratoRate)
				}
			}
		}
	}
}

// A phrase of held notes separated by short rests and one slur: onsets and
// offsets within two hops of the truth, centre within a hundredth of a cent,
// no vibrato reported on steady tones.
func TestHeldNotesInAPhrase(t *testing.T) {
	rate := 48000.0
	type note struct{ hz, start, end float64 }
	// D4, F#4 (5-limit major third above D, 386.31 ¢), A4 slurred from F#4, then D5.
	phrase := []note{{293.6648, 0.2, 0.9}, {293.6648 * 5 / 4, 1.0, 1.6}, {440, 1.6, 2.2}, {587.3295, 2.4, 3.0}}
	x := make([]float64, int(rate*3.3))
	for _, n := range phrase {
		tone := testsignal.Tone(rate, int(rate*(n.end-n.start)), testsignal.Saw, 0.3, testsignal.Steady(n.hz))
		for i, v := range tone {
			x[int(rate*n.start)+i] += v
		}
	}
	notes := segment(run(t, rate, x), rate)
	if len(notes) != len(phrase) {
		t.Fatalf("%d notes, want %d: %+v", len(notes), len(phrase), notes)
	}
	hop := 512 / rate
	for i, n := range notes {
		want := phrase[i]
		if c := testsignal.Cents(n.Hz, want.hz); math.Abs(c) > 0.01 || n.VibratoWidth != 0 || n.Spread > 0.01 {
			t.Errorf("note %d: %.4f Hz (%+.4f ¢), spread %.4f ¢, vibrato %.2f ¢", i, n.Hz, c, n.Spread, n.VibratoWidth)
		}
		// The first voiced frame's window is centred a little before the
		// onset (it needs only part of its window filled).
		if math.Abs(n.Start-want.start) > 0.06 || math.Abs(n.End-want.end) > 0.06 {
			t.Errorf("note %d: %.3f..%.3f s, want %.3f..%.3f (hop %.4f s)", i, n.Start, n.End, want.start, want.end, hop)
		}
	}
}

// The live meter needs a first reading within 60 ms of the onset for notes
// above 80 Hz: time is counted in samples fed when Current first reports.
// The tones start with a 5 ms attack (testsignal.FadeIn).
func TestFirstReadingWithin60ms(t *testing.T) {
	for _, rate := range []float64{44100, 48000, 96000} {
		for _, hz := range []float64{82.4069, 110, 220, 440, 1318.51} {
			for _, s := range []testsignal.Spectrum{testsignal.Saw, testsignal.WeakFund} {
				if got := firstReading(t, rate, hz, s); got > 0.060 {
					t.Errorf("%g Hz rate, %s %.1f Hz: first reading %.1f ms after onset", rate, s.Name, hz, got*1000)
				}
			}
		}
	}
}

// An abrupt sine (as sox's synth makes one) at the equal-tempered notes C4 to
// D5 (ISO 16, A4 = 440 Hz): the first reading comes within 60 ms and is
// already within half the smallest enharmonic gap of the built-in
// temperaments, so the meter never flashes a wrong spelling; later frames
// refine it. That gap is ⅙-comma meantone's: twelve of its fifths (a pure
// 3/2, 701.955 ¢, less a sixth of the syntonic comma, 21.506 ¢; handbook
// values and the temperament's definition) fall 19.55 ¢ short of seven
// octaves, so F♯ and G♭ lie 19.55 ¢ apart.
func TestFirstReadingOfAnAbruptSine(t *testing.T) {
	gap := 7*1200 - 12*(701.955-21.506/6)
	for i := range 10 {
		hz := 440 * math.Exp2(float64(2*i-9)/12)
		at, err := firstReadingError(t, 48000, hz, testsignal.Sine, 0)
		if at > 0.060 || math.Abs(err) > gap/2 {
			t.Errorf("%.3f Hz: first reading %.1f ms after onset, %+.2f ¢ off", hz, at*1000, err)
		}
	}
}

// firstReading returns seconds from onset to the first Current reading
// within 50 cents of the truth, feeding one hop at a time.
func firstReading(t *testing.T, rate, hz float64, s testsignal.Spectrum) float64 {
	at, _ := firstReadingError(t, rate, hz, s, 0.005)
	return at
}

// firstReadingError is firstReading with the reading's error in cents, for
// a tone with the given attack.
func firstReadingError(t *testing.T, rate, hz float64, s testsignal.Spectrum, attack float64) (float64, float64) {
	onset := 0.3
	x := make([]float64, int(rate*(onset+0.5)))
	tone := testsignal.Tone(rate, len(x)-int(rate*onset), s, 0.3, testsignal.Steady(hz))
	if attack > 0 {
		testsignal.FadeIn(tone, rate, attack)
	}
	copy(x[int(rate*onset):], tone)
	in := testsignal.Float32(x)
	d, _ := New(rate, 0, 0)
	seg := NewSegmenter(float64(d.Hop()) / rate)
	var out []Estimate
	for i := 0; i < len(in); i += d.Hop() {
		out = d.Feed(in[i:min(i+d.Hop(), len(in))], out[:0])
		for _, e := range out {
			seg.Push(e)
			if h, ok := seg.Current(); ok && math.Abs(testsignal.Cents(h.Hz, hz)) < 50 {
				return float64(i+d.Hop())/rate - float64(int(rate*onset))/rate, testsignal.Cents(h.Hz, hz)
			}
		}
	}
	return math.Inf(1), math.NaN()
}

func TestSegmenterIgnoresASingleStrayFrame(t *testing.T) {
	s := NewSegmenter(0.01)
	var got []Held
	for i := range 40 {
		e := Estimate{Time: float64(i) * 0.01, Hz: 440, Voiced: true, Confidence: 1}
		if i == 20 {
			e.Hz = 880 // one octave-error frame
		}
		if h, ok := s.Push(e); ok {
			got = append(got, h)
		}
	}
	if h, ok := s.Flush(); ok {
		got = append(got, h)
	}
	if len(got) != 1 || got[0].Hz != 440 || got[0].Frames != 39 {
		t.Errorf("got %+v, want one 440 Hz note of 39 frames", got)
	}
}

// Slurred leaps of an octave and a fifth: while a note holds the detector
// seeds each frame with the last pitch, so a leap must still be heard as a
// new note at its own pitch (octave and fifth guards, then a fresh NSDF).
func TestSlurredOctaveAndFifthLeaps(t *testing.T) {
	rate := 44100.0
	pitches := []float64{220, 440, 293.6648, 587.3295, 195.9977} // A3 A4 D4 D5 G3
	var x []float64
	for _, hz := range pitches {
		x = append(x, testsignal.Tone(rate, int(rate*0.5), testsignal.Saw, 0.3, testsignal.Steady(hz))...)
	}
	notes := segment(run(t, rate, x), rate)
	if len(notes) != len(pitches) {
		t.Fatalf("%d notes, want %d: %+v", len(notes), len(pitches), notes)
	}
	for i, n := range notes {
		if c := testsignal.Cents(n.Hz, pitches[i]); math.Abs(c) > 0.01 {
			t.Errorf("note %d: %.4f Hz (%+.4f ¢), want %.4f", i, n.Hz, c, pitches[i])
		}
	}
}

// A note whose attack was heard a twelfth or an octave low for a few frames
// (seen on the real microphone path with a sharp sawtooth attack) is one
// note, starting where the misreading started; a slurred leap from a held
// note to its twelfth stays two notes (TestSlurredOctaveAndFifthLeaps).
func TestAttackReadASubharmonicLowIsPartOfTheNote(t *testing.T) {
	for _, low := range []float64{246.94 / 3, 246.94 / 2} {
		s := NewSegmenter(0.01)
		var got []Held
		for i := range 60 {
			e := Estimate{Time: 1 + float64(i)*0.01, Hz: 246.94, Voiced: true, Confidence: 1}
			if i < 8 {
				e.Hz = low // the first 80 ms misread
			}
			if h, ok := s.Push(e); ok {
				got = append(got, h)
			}
		}
		if h, ok := s.Flush(); ok {
			got = append(got, h)
		}
		if len(got) != 1 || got[0].Hz != 246.94 || got[0].Start != 1 {
			t.Errorf("attack at %.2f Hz: got %+v, want one 246.94 Hz note from 1 s", low, got)
		}
	}
}

// pushAll feeds estimates (hz 0 = unvoiced) at 10 ms hops with the given
// levels and returns the held notes.
func pushAll(hz, level []float64) []Held {
	s := NewSegmenter(0.01)
	var got []Held
	for i := range hz {
		e := Estimate{Time: float64(i) * 0.01, Hz: hz[i], Voiced: hz[i] > 0, Confidence: 1, Level: level[i]}
		if h, ok := s.Push(e); ok {
			got = append(got, h)
		}
	}
	if h, ok := s.Flush(); ok {
		got = append(got, h)
	}
	return got
}

// track builds a frame track from segments of (frames, hz, level dBFS).
func track(parts ...[3]float64) (hz, level []float64) {
	for _, p := range parts {
		for range int(p[0]) {
			hz, level = append(hz, p[1]), append(level, p[2])
		}
	}
	return hz, level
}

// What is and is not a held note, on synthetic frame tracks (the shapes are
// those seen on fluidsynth renders with reverberation; see
// cmd/fifthline's TestAnalyzeHearsEachNoteOfRenderedScales).
func TestWhatIsAHeldNote(t *testing.T) {
	for _, tc := range []struct {
		name  string
		parts [][3]float64
		want  []float64 // the notes' pitches
	}{
		{"the detector missing frames at the note's level is not the note ending",
			[][3]float64{{20, 440, -20}, {8, 0, -21}, {20, 440, -20}}, []float64{440}},
		{"a fall in level with no pitch ends the note",
			[][3]float64{{20, 440, -20}, {8, 0, -40}, {20, 440, -20}}, []float64{440, 440}},
		{"a quiet attackless echo of the note after it ends is not a note",
			[][3]float64{{30, 440, -20}, {4, 0, -40}, {12, 440, -32}, {20, 0, -60}}, []float64{440}},
		{"a note repeated softer, with an attack, is a note",
			[][3]float64{{30, 440, -20}, {4, 0, -40}, {3, 440, -34}, {12, 440, -28}, {20, 0, -60}}, []float64{440, 440}},
		{"a blip shorter than 0.1 s between two notes is not a note",
			[][3]float64{{30, 349.23, -20}, {7, 987.77, -22}, {30, 392, -20}}, []float64{349.23, 392}},
		// Quick legato runs rendered by fluidsynth (cmd/fifthline's
		// TestAnalyzeHearsEveryNoteOfQuickLegatoRuns): a sixteenth at
		// ♩ = 100 lasts 0.15 s, of which the detector gives 0.08 s to the
		// note itself and the rest to the slurs on either side.
		{"a slurred note lasts from the middle of the slur into it until the next starts",
			[][3]float64{{20, 440, -20}, {4, 0, -20}, {8, 493.88, -20}, {3, 0, -20}, {20, 523.25, -20}}, []float64{440, 493.88, 523.25}},
		{"a slur read at the period its two notes share is the next note starting",
			[][3]float64{{20, 392, -20}, {9, 196, -20}, {20, 587.33, -20}}, []float64{392, 587.33}},
		{"a quick note slurred on up an octave, through frames read as neither, is a note",
			[][3]float64{{20, 659.26, -20}, {3, 0, -20}, {8, 261.63, -20}, {3, 0, -20}, {20, 523.25, -20}}, []float64{659.26, 261.63, 523.25}},
		// ¼-comma meantone at A4 = 440 Hz (step_test.go): A♭4 421.09 Hz,
		// G♯4 411.22 Hz, a lesser diesis (41.06 ¢) apart.
		{"a step under 50 ¢ that holds 0.25 s on both sides is two notes",
			[][3]float64{{40, 421.09, -20}, {40, 411.22, -20}}, []float64{421.09, 411.22}},
		// Its steady part holds 62 frames of A♭4 and 15 of G♯4: their mean
		// in cents, 8.0 ¢ under A♭4.
		{"a step held 0.15 s is no note of its own",
			[][3]float64{{40, 421.09, -20}, {15, 411.22, -20}, {40, 421.09, -20}}, []float64{419.15}},
	} {
		hz, level := track(tc.parts...)
		got := pushAll(hz, level)
		var pitches []float64
		for _, h := range got {
			pitches = append(pitches, math.Round(h.Hz*100)/100)
		}
		if len(pitches) != len(tc.want) || (len(pitches) > 0 && pitches[0] != tc.want[0]) || (len(pitches) > 1 && pitches[1] != tc.want[1]) {
			t.Errorf("%s: notes %v, want %v", tc.name, pitches, tc.want)
		}
	}
}

// While a note is held the meter shows what the player does now: a note
// held 10 s at 20 ¢ flat and then brought up to 440 Hz reads 440 Hz live
// after 5 s on pitch, while the finished note is summarised whole.
func TestCurrentDescribesTheLastSeconds(t *testing.T) {
	s := NewSegmenter(0.01)
	flat := 440 * math.Exp2(-20.0/1200)
	for i := range 1500 {
		hz := flat
		if i >= 1000 {
			hz = 440
		}
		s.Push(Estimate{Time: float64(i) * 0.01, Hz: hz, Voiced: true, Confidence: 1, Level: -20})
	}
	live, ok := s.Current()
	if !ok || math.Abs(testsignal.Cents(live.Hz, 440)) > 0.01 || live.Start != 0 || live.Frames != 1500 {
		t.Errorf("live: %+v, want 440 Hz over the last seconds of a note from 0 s, 1500 frames", live)
	}
	done, _ := s.Flush()
	if c := testsignal.Cents(done.Hz, 440); c > -12 || c < -14 { // two thirds of it at −20 ¢
		t.Errorf("finished note at %+.2f ¢, want about −13.3", c)
	}
}

// Current's cost on a note held for five minutes (a drone exercise); it
// must not grow with the note's length.
func BenchmarkCurrentOnALongNote(b *testing.B) {
	s := NewSegmenter(0.01)
	for i := range 30000 {
		s.Push(Estimate{Time: float64(i) * 0.01, Hz: 440 * math.Exp2(10*math.Sin(float64(i)*0.35)/1200), Voiced: true, Confidence: 1, Level: -20})
	}
	for b.Loop() {
		s.Current()
	}
}

// A note slurred on to the next is read up to half a window before its last
// frame: the slur lies after that frame (the frames whose window holds both
// notes are read as neither), and each frame's window reaches half a window
// either side of it. A note whose pitch still moves (FluidR3's violin's
// high eighths, in cmd/fifthline's TestAnalyzeHearsEveryNoteOfQuickLegatoRuns)
// is read from all of those frames, not only its first ones: here one
// rising 0.5 ¢ a frame and turning back halfway, the mean of those frames.
// One that moves one way only (rising 0.5 ¢ a frame throughout) has no
// settled part and is read on to half a window before the next note's
// first frame, as its own began half a window after the last note's: the
// median of those frames.
func TestASlurredNoteIsReadToHalfAWindowBeforeItsLastFrame(t *testing.T) {
	const hop, rise = 0.01, 0.5 // seconds; cents a frame
	for _, c := range []struct {
		name  string
		cents func(i int) float64 // frame i of 30
		until func(last, next, window float64) float64
		read  func(c []float64) float64
	}{
		{"turning back", func(i int) float64 { return rise * float64(min(i, 30-i)) },
			func(last, _, window float64) float64 { return last - window/2 }, mean},
		{"moving one way", func(i int) float64 { return rise * float64(i) },
			func(_, next, window float64) float64 { return next - window/2 }, middle},
	} {
		s := NewSegmenter(hop)
		var got []Held
		var times, frames []float64 // the middle note's frames: seconds, cents above B4
		n := 0
		add := func(count int, hz func(i int) float64) {
			for i := range count {
				h := hz(i)
				if h, ok := s.Push(Estimate{Time: float64(n) * hop, Hz: h, Voiced: h > 0, Confidence: 1, Level: -20}); ok {
					got = append(got, h)
				}
				n++
			}
		}
		b4 := 493.88 // B4, equal-tempered at A4 = 440 Hz (common practice)
		add(20, func(int) float64 { return 440 })
		add(4, func(int) float64 { return 0 })
		add(30, func(i int) float64 {
			times = append(times, float64(n)*hop)
			frames = append(frames, c.cents(i))
			return b4 * math.Exp2(c.cents(i)/1200)
		})
		next := float64(n+4) * hop
		add(4, func(int) float64 { return 0 })
		add(20, func(int) float64 { return 523.25 })
		if h, ok := s.Flush(); ok {
			got = append(got, h)
		}
		if len(got) != 3 {
			t.Fatalf("%s: %d notes, want 3", c.name, len(got))
		}
		var read []float64
		for i, f := range frames {
			if times[i] <= c.until(times[len(times)-1], next, s.Window)+1e-9 {
				read = append(read, f)
			}
		}
		if got, want := testsignal.Cents(got[1].Hz, b4), c.read(read); math.Abs(got-want) > 0.01 {
			t.Errorf("%s: the slurred note reads %+.3f ¢, want %+.3f", c.name, got, want)
		}
	}
}

func mean(c []float64) float64 { m, _ := meanStd(c); return m }

// middle is the median of c.
func middle(c []float64) float64 {
	c = slices.Sorted(slices.Values(c))
	return (c[(len(c)-1)/2] + c[len(c)/2]) / 2
}
