package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// ¼-comma meantone at A4 = 440 Hz: fifths of 5^(1/4) (696.58 ¢), A♭4 seven
// fifths down from A4 and four octaves up (421.09 Hz), G♯4 five up and
// four octaves down (411.22 Hz), a lesser diesis (128/125, 41.06 ¢) below
// it (published definition; common practice).
const (
	meantoneAb4 = 421.0914
	meantoneGs4 = 411.2209
)

// A step that holds on both sides is two notes, however small against
// JumpCents; a step under the commas a held note is tuned by is one note
// tuned. Each side is a sox sawtooth held 0.5 s (sox: a reference tool),
// joined without a break.
func TestAHeldStepIsTwoNotes(t *testing.T) {
	const rate = 48000.0
	for _, c := range []struct {
		name   string
		hz     [2]float64
		notes  int
		source string
	}{
		{"A♭4 to G♯4", [2]float64{meantoneAb4, meantoneGs4}, 2, "lesser diesis, 41.06 ¢"},
		{"30 ¢ down", [2]float64{meantoneAb4, meantoneAb4 * math.Exp2(-30.0/1200)}, 2, "over StepCents"},
		{"G♯4 to A♭4", [2]float64{meantoneGs4, meantoneAb4}, 2, "the diesis up"},
		{"20 ¢ down", [2]float64{meantoneAb4, meantoneAb4 * math.Exp2(-20.0/1200)}, 1, "under the syntonic comma, 21.51 ¢"},
	} {
		x := append(soxSynth(t, rate, "sawtooth", c.hz[0], 0.5), soxSynth(t, rate, "sawtooth", c.hz[1], 0.5)...)
		d, err := New(rate, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		notes := segment(d.Feed(x, nil), rate)
		if len(notes) != c.notes {
			t.Errorf("%s (%s): %d notes, want %d: %+v", c.name, c.source, len(notes), c.notes, notes)
			continue
		}
		if c.notes == 1 {
			continue
		}
		for i, n := range notes {
			if off := testsignal.Cents(n.Hz, c.hz[i]); math.Abs(off) > 0.5 {
				t.Errorf("%s: note %d at %.3f Hz, %+.2f ¢ from %.3f Hz", c.name, i, n.Hz, off, c.hz[i])
			}
		}
		// The step lies at 0.5 s; the detector voices a frame once part of
		// its window holds a note, so each note's ends lie within a window
		// (about 0.1 s) of it.
		if w := d.NewSegmenter().Window; math.Abs(notes[0].End-0.5) > w || math.Abs(notes[1].Start-0.5) > w {
			t.Errorf("%s: notes end %.3f s and start %.3f s, step at 0.5 s", c.name, notes[0].End, notes[1].Start)
		}
	}
}

// What moves inside one note is no step: a vibrato of ±40 or ±50 ¢ (wider
// than sung or bowed vibrato usually swings: common practice, from
// memory), a 60 ¢ glide into a held note, and a held note drifting 30 ¢
// over 1.5 s.
func TestMovementInsideANoteIsNoStep(t *testing.T) {
	const rate = 48000.0
	glide := func(t float64) float64 { // 60 ¢ up over 0.15 s, then held
		return meantoneGs4 * math.Exp2(-60*max(0, 1-t/0.15)/1200)
	}
	drift := func(t float64) float64 { return meantoneGs4 * math.Exp2(30*t/1.5/1200) }
	for _, c := range []struct {
		name    string
		seconds float64
		hz      func(float64) float64
	}{
		{"vibrato ±40 ¢ at 5.5 Hz", 1.0, testsignal.Vibrato(meantoneGs4, 80, 5.5)},
		{"vibrato ±50 ¢ at 4.5 Hz", 1.0, testsignal.Vibrato(meantoneGs4, 100, 4.5)},
		{"vibrato ±40 ¢ at 3.5 Hz", 1.0, testsignal.Vibrato(meantoneGs4, 80, 3.5)},
		{"60 ¢ glide into a held note", 0.65, glide},
		{"drift of 30 ¢ over 1.5 s", 1.5, drift},
	} {
		x := testsignal.Tone(rate, int(rate*c.seconds), testsignal.Saw, 0.5, c.hz)
		if notes := segment(run(t, rate, x), rate); len(notes) != 1 {
			t.Errorf("%s: %d notes, want 1: %+v", c.name, len(notes), notes)
		}
	}
}

// Real timbres: FluidR3 (fluidsynth) holding G♯4 and A♭4 of ¼-comma
// meantone one after the other without a break, MIDI key 68 (equal
// temperament's G♯4, 415.30 Hz) bent to each (+24.03 ¢ is A♭4, −17.03 ¢
// G♯4), both ways, on winds and voices whose notes hold steady: two notes,
// each within 3 ¢ of its pitch (an attack's settling pulls a little). A
// 20 ¢ step, a comma's correction, stays one note. (Bowed strings' and the
// flute's vibrato hold no steady side: step.go.)
func TestFluidR3DiesisStepsAreTwoNotes(t *testing.T) {
	const rate = 48000.0
	for _, p := range []struct {
		name    string
		program int // General MIDI, 0-based
	}{{"clarinet", 71}, {"oboe", 68}, {"trumpet", 56}, {"horn", 60}, {"tenor sax", 66}} {
		for _, c := range []struct {
			cents [2]float64
			notes int
		}{{[2]float64{24.03, -17.03}, 2}, {[2]float64{-17.03, 24.03}, 2}, {[2]float64{24.03, 4.03}, 1}} {
			x, _ := fluidMIDI(t, testsignal.MIDIParts([]testsignal.MIDIPart{{Program: p.program, Notes: []testsignal.TimedNote{
				{Key: 68, Start: 0.2, Seconds: 0.8, Cents: c.cents[0]}, {Key: 68, Start: 1.0, Seconds: 0.8, Cents: c.cents[1]}}}}))
			d, err := New(rate, 0, 0)
			if err != nil {
				t.Fatal(err)
			}
			notes := segment(d.Feed(x, nil), rate)
			if len(notes) != c.notes {
				t.Errorf("%s %+.2f ¢ then %+.2f ¢: %d notes, want %d: %+v", p.name, c.cents[0], c.cents[1], len(notes), c.notes, notes)
				continue
			}
			for i, n := range notes {
				want := 415.3047 * math.Exp2(testsignal.BendCents(c.cents[i])/1200)
				if c.notes == 2 && math.Abs(testsignal.Cents(n.Hz, want)) > 3 {
					t.Errorf("%s %+.2f ¢ then %+.2f ¢: note %d at %.3f Hz, %+.2f ¢ from %.3f Hz",
						p.name, c.cents[0], c.cents[1], i, n.Hz, testsignal.Cents(n.Hz, want), want)
				}
			}
		}
	}
}

// Push's cost per frame on a held note, steady within a cent (the case
// where heldStep looks furthest: its recent frames hold, every frame), with
// held steps judged and without (StepCents 0), and with a vibrato of ±15 ¢
// at 5.5 Hz (each frame's side fitted: vibratoStep).
func BenchmarkPushOnAHeldNote(b *testing.B) {
	for _, c := range []struct {
		name    string
		cents   float64
		vibrato bool
	}{{"steps", stepCents, false}, {"jumps only", 0, false}, {"steps, vibrato", stepCents, true}} {
		b.Run(c.name, func(b *testing.B) {
			s := NewSegmenter(0.01)
			s.StepCents = c.cents
			i := 0
			for b.Loop() {
				cents := math.Sin(float64(i) * 0.35)
				if c.vibrato {
					cents = 15 * math.Sin(2*math.Pi*5.5*float64(i)*0.01)
				}
				s.Push(Estimate{Time: float64(i) * 0.01, Hz: 440 * math.Exp2(cents/1200), Voiced: true, Confidence: 1, Level: -20})
				i++
				if i == 30000 { // a five-minute note, then the next
					s.Flush()
					i = 0
				}
			}
		})
	}
}

// Any frame track, steps and all, gives notes in order, each within its
// frames' time and pitch, and never a panic.
func FuzzSegmenterSteps(f *testing.F) {
	f.Add([]byte{100, 100, 100, 100, 90, 90, 90, 90})
	f.Add([]byte{0, 255, 1, 254, 128, 128, 0, 0, 200})
	f.Fuzz(func(t *testing.T, b []byte) {
		s := NewSegmenter(0.01)
		var notes []Held
		for i, v := range b {
			for k := range 8 { // each byte a step held 8 frames: 3 ¢ a unit about A♭4
				e := Estimate{Time: float64(8*i+k) * 0.01, Level: -20, Confidence: 1}
				if v > 0 {
					e.Hz, e.Voiced = meantoneGs4*math.Exp2(3*(float64(v)-128)/1200), true
				}
				if h, ok := s.Push(e); ok {
					notes = append(notes, h)
				}
			}
		}
		if h, ok := s.Flush(); ok {
			notes = append(notes, h)
		}
		lo, hi := meantoneGs4*math.Exp2(-3*128.0/1200), meantoneGs4*math.Exp2(3*127.0/1200)
		last := -1.0
		for _, h := range notes {
			if !(h.Start >= last && h.End >= h.Start && h.Hz >= lo*0.999 && h.Hz <= hi*1.001) {
				t.Fatalf("note %+v after %.2f s, pitches %.1f–%.1f Hz", h, last, lo, hi)
			}
			last = h.End
		}
	})
}
