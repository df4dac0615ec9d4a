package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
	"fifthline/mts"
)

// A player's vibrato is no obstacle to a held step. A sawtooth swinging
// ±15 ¢ at 5.5 Hz (a sung or bowed vibrato's rate and about its width:
// common practice, from memory) about ¼-comma meantone's A♭4 for 0.6 s,
// then without a break about its G♯4, a lesser diesis (41.06 ¢) lower, for
// 0.6 s, or the other way round, is two notes, each within 1 ¢ of its
// centre (the tone's definition; measured within 0.13 ¢); about either
// alone, it is one note.
// (sox's synth cannot draw a vibrato: its fmod multiplies the input by the
// tone, a ring modulation; measured.)
func TestAVibratoStepIsTwoNotes(t *testing.T) {
	const rate, side = 48000.0, 0.6
	for _, c := range diesisCases(meantoneAb4, meantoneGs4) {
		hz := func(t float64) float64 {
			return testsignal.Vibrato(c.centre[min(int(t/side), 1)], 30, 5.5)(t)
		}
		x := testsignal.Tone(rate, int(2*side*rate), testsignal.Saw, 0.5, hz)
		notes := segment(run(t, rate, x), rate)
		if len(notes) != c.notes {
			t.Errorf("%s: %d notes, want %d: %+v", c.name, len(notes), c.notes, notes)
			continue
		}
		for i, n := range notes {
			if off := testsignal.Cents(n.Hz, c.centre[i]); math.Abs(off) > 1 {
				t.Errorf("%s: note %d at %.3f Hz, %+.2f ¢ from its centre %.3f Hz", c.name, i, n.Hz, off, c.centre[i])
			} else {
				t.Logf("%s: note %d %.3f–%.3f s, %+.2f ¢ from its centre", c.name, i, n.Start, n.End, off)
			}
		}
	}
}

// A portamento is no step, with vibrato or without: a sawtooth holding
// A♭4 for 0.4 s, sliding down the lesser diesis to G♯4 over 0.8 s and
// holding that 0.4 s is one note, steady and with a vibrato of ±15 or
// ±40 ¢ at 5.5 Hz (their running centre moving on the way, no side of the
// slide holds).
func TestAPortamentoIsOneNote(t *testing.T) {
	const rate, hold, slide = 48000.0, 0.4, 0.8
	for _, width := range []float64{0, 30, 80} { // cents peak to peak
		hz := func(t float64) float64 {
			down := 1200 * math.Log2(meantoneGs4/meantoneAb4) * min(max(t-hold, 0)/slide, 1)
			return testsignal.Vibrato(meantoneAb4*math.Exp2(down/1200), width, 5.5)(t)
		}
		x := testsignal.Tone(rate, int((2*hold+slide)*rate), testsignal.Saw, 0.5, hz)
		if notes := segment(run(t, rate, x), rate); len(notes) != 1 {
			t.Errorf("vibrato %g ¢ wide: %d notes, want 1: %+v", width, len(notes), notes)
		}
	}
}

// Real timbre: FluidR3's clarinet (General MIDI 71, fluidsynth), whose own
// notes hold steady, holds MIDI key 68 (G♯4 in equal temperament,
// 415.30 Hz: ISO 16) without a break while a pitch bend swings it ±15 ¢ at
// 5.5 Hz about ¼-comma meantone's A♭4 (+24.03 ¢) for 0.6 s, then about its
// G♯4 (−17.03 ¢), or the other way round: two notes, each within 3 ¢ of its
// centre (as TestFluidR3DiesisStepsAreTwoNotes: the attack's settling
// pulls a little). About either alone, it is one note.
func TestAFluidR3VibratoStepIsTwoNotes(t *testing.T) {
	for _, c := range diesisCases(24.03, -17.03) {
		x, _ := fluidMIDI(t, bentVibrato(71, 68, c.centre, 0.6, 15, 5.5))
		notes := segment(run(t, 48000, float64s(x)), 48000)
		if len(notes) != c.notes {
			t.Errorf("%s: %d notes, want %d: %+v", c.name, len(notes), c.notes, notes)
			continue
		}
		for i, n := range notes {
			want := 415.3047 * math.Exp2(testsignal.BendCents(c.centre[i])/1200)
			if off := testsignal.Cents(n.Hz, want); math.Abs(off) > 3 {
				t.Errorf("%s: note %d at %.3f Hz, %+.2f ¢ from its centre %.3f Hz", c.name, i, n.Hz, off, want)
			} else {
				t.Logf("%s: note %d %.3f–%.3f s, %+.2f ¢ from its centre", c.name, i, n.Start, n.End, off)
			}
		}
	}
}

// diesisCase is a vibrato about centre[0] then centre[1], which is notes
// notes.
type diesisCase struct {
	name   string
	centre [2]float64
	notes  int
}

// diesisCases are a step from A♭4 (ab) to G♯4 (gs) and back, two notes,
// and either held, one.
func diesisCases(ab, gs float64) []diesisCase {
	return []diesisCase{
		{"A♭4 to G♯4", [2]float64{ab, gs}, 2},
		{"G♯4 to A♭4", [2]float64{gs, ab}, 2},
		{"A♭4 held", [2]float64{ab, ab}, 1},
		{"G♯4 held", [2]float64{gs, gs}, 1},
	}
}

// bentVibrato is a Standard MIDI File of one note (key, on General MIDI
// program) from 0.2 s, held seconds about each of two centres (cents) in
// turn, its pitch bent every 1/96 s to a vibrato of ±width cents at rate
// Hz about the centre of the moment; the bend's range is ±200 ¢ (General
// MIDI).
func bentVibrato(program, key int, centre [2]float64, seconds, width, rate float64) []byte {
	const start, every = 0.2, 10 // ticks between bends: 1/96 s
	var tr mts.Track
	bend := func(delta int, cents float64) {
		b := testsignal.BendValue(cents)
		tr.Channel(delta, 0xE0, byte(b&0x7f), byte(b>>7))
	}
	tr.Channel(0, 0xC0, byte(program))
	bend(0, centre[0])
	tr.Channel(int(start*mts.TicksPerSecond), 0x90, byte(key), 96)
	n := int(2 * seconds * mts.TicksPerSecond / every)
	for i := 1; i < n; i++ {
		t := float64(i*every) / mts.TicksPerSecond
		bend(every, centre[min(int(t/seconds), 1)]+width*math.Sin(2*math.Pi*rate*t))
	}
	tr.Channel(every, 0x80, byte(key), 0)
	return tr.File(mts.TicksPerSecond / 2)
}

// FluidR3's bowed strings and flute (fluidsynth) holding ¼-comma meantone's
// G♯4 and A♭4 one after the other without a break, as in
// TestFluidR3DiesisStepsAreTwoNotes: their vibrato (the violin's, viola's
// and cello's ±10–16 ¢, the flute's ±7 ¢ of wavering: measured) held no
// steady side, and each pair was one note. Now two, each read within 3.5 ¢
// of the same instrument holding its pitch alone for as long (measured:
// the violin within 1 ¢, the viola 2.9).
func TestFluidR3VibratoDiesisStepsAreTwoNotes(t *testing.T) {
	read := func(program int, notes []testsignal.TimedNote) []Held {
		x, _ := fluidMIDI(t, testsignal.MIDIParts([]testsignal.MIDIPart{{Program: program, Notes: notes}}))
		return segment(run(t, 48000, float64s(x)), 48000)
	}
	for _, p := range []struct {
		name    string
		program int // General MIDI, 0-based
	}{{"violin", 40}, {"viola", 41}, {"cello", 42}, {"flute", 73}} {
		alone := map[float64]float64{}
		for _, cents := range []float64{24.03, -17.03} {
			if h := read(p.program, []testsignal.TimedNote{{Key: 68, Start: 0.2, Seconds: 0.8, Cents: cents}}); len(h) == 1 {
				alone[cents] = h[0].Hz
			} else {
				t.Fatalf("%s %+.2f ¢ alone: %d notes: %+v", p.name, cents, len(h), h)
			}
		}
		for _, c := range [][2]float64{{24.03, -17.03}, {-17.03, 24.03}} {
			notes := read(p.program, []testsignal.TimedNote{
				{Key: 68, Start: 0.2, Seconds: 0.8, Cents: c[0]}, {Key: 68, Start: 1.0, Seconds: 0.8, Cents: c[1]}})
			if len(notes) != 2 {
				t.Errorf("%s %+.2f ¢ then %+.2f ¢: %d notes, want 2: %+v", p.name, c[0], c[1], len(notes), notes)
				continue
			}
			for i, n := range notes {
				if off := testsignal.Cents(n.Hz, alone[c[i]]); math.Abs(off) > 3.5 {
					t.Errorf("%s %+.2f ¢ then %+.2f ¢: note %d %+.2f ¢ from the pitch held alone", p.name, c[0], c[1], i, off)
				}
			}
		}
	}
}

// A held note's vibrato is no step, even to a StepCents under the commas:
// FluidR3's violin, viola, cello and flute (fluidsynth) holding keys across
// their range 2 s each are one note a key with held steps of 20 ¢ and over
// judged (measured: the violin and viola split once each at 15 ¢, as by
// steady sides alone).
func TestFluidR3VibratoNotesHoldNoStep(t *testing.T) {
	for _, p := range []struct {
		name    string
		program int // General MIDI, 0-based
		keys    []int
	}{
		{"violin", 40, []int{55, 62, 69, 76, 83, 88}},
		{"viola", 41, []int{55, 62, 69, 76}},
		{"cello", 42, []int{36, 43, 50, 57, 64, 69}},
		{"flute", 73, []int{60, 67, 74, 81, 88}},
	} {
		x, _ := fluidHeld(t, p.program, p.keys)
		d, err := New(48000, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		s := d.NewSegmenter()
		s.StepCents = 20
		notes := segmentWith(s, d.Feed(x, nil))
		if len(notes) != len(p.keys) {
			t.Errorf("%s: %d notes for %d keys: %+v", p.name, len(notes), len(p.keys), notes)
		}
	}
}
