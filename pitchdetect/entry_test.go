package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A quiet entry over what is left of a neighbour's bleed starts where the
// same entry starts alone. A voice's G4 swells in over 80 ms (a sung
// attack; the FluidR3 voice oohs take about as long, measured) while a
// lower part's C3, whose third harmonic the G4 is, goes on 25–40 dB under
// the G4's level, as a player's channel keeps it after the bleed is
// subtracted (the choir take's soprano channel held the bass's C3 some
// 40 dB under its G4 once the bleed was learned, about 20 dB before:
// measured). Pitches in equal temperament at A4 = 440 Hz (ISO 16). The
// truth is the same G4 without the C3: its first voiced frame (at 0.571 s)
// and its note's start. With the leftover, the detector had read the C3
// as a held note and kept the G4 at it (its third harmonic) until 0.624 s
// at every level: 53 ms late. Now the G4 is first read at most two hops
// after the lone entry (21 ms at 25 and 30 dB, 11 ms at 40 dB), every
// voiced frame after that reads G4 (within 50 ¢; an attack's first frames
// need not be nearer), and its note starts within two hops of the lone
// one's. (At 20 dB under, as loud as the entry's first frames, it is read
// 42 ms late: the sum then repeats at C3's period.)
func TestAQuietEntryOverLeftoverBleedStartsOnTime(t *testing.T) {
	const rate = 48000.0
	voice := testsignal.Spectrum{Name: "sung ooh", Amps: []float64{1, 0.5, 0.25, 0.12, 0.08, 0.05, 0.03}}
	leftover := testsignal.Spectrum{Name: "leftover bleed", Amps: []float64{1, 0.7, 0.4, 0.5, 0.3, 0.2, 0.15, 0.1}}
	g4, c3 := 391.99544, 130.81278
	n, at := int(1.5*rate), int(0.6*rate)
	entry := testsignal.Tone(rate, n-at, voice, 0.1, testsignal.Steady(g4))
	testsignal.FadeIn(entry, rate, 0.08)
	alone := append(make([]float64, at), entry...)
	first := func(est []Estimate) Estimate {
		for _, e := range est {
			if e.Voiced {
				return e
			}
		}
		return Estimate{}
	}
	estAlone := run(t, rate, alone)
	want, wantNotes := first(estAlone), segment(estAlone, rate)
	if len(wantNotes) != 1 {
		t.Fatalf("alone: %d notes", len(wantNotes))
	}
	late := 2 * 512 / rate // two hops: a frame or two
	for _, under := range []float64{25, 30, 40} {
		x := testsignal.Tone(rate, n, leftover, 0.1*math.Pow(10, -under/20), testsignal.Steady(c3))
		for i, v := range alone {
			x[i] += v
		}
		est := run(t, rate, x)
		// Before the entry the leftover alone may read C3 (whose it is,
		// only the ensemble can tell); from two hops after the lone
		// entry's first frame every voiced frame is the G4's.
		var got Estimate
		for _, e := range est {
			if e.Time < want.Time-1e-9 {
				continue
			}
			if e.Voiced && got.Time == 0 && math.Abs(testsignal.Cents(e.Hz, g4)) < 50 {
				got = e
			}
			if e.Voiced && e.Time > want.Time+late+1e-9 && math.Abs(testsignal.Cents(e.Hz, g4)) > 50 {
				t.Errorf("leftover %g dB under: the frame at %.3f s reads %.2f Hz, not G4", under, e.Time, e.Hz)
			}
		}
		if got.Time == 0 || got.Time > want.Time+late+1e-9 {
			t.Errorf("leftover %g dB under: G4 first read at %.3f s, alone at %.3f s", under, got.Time, want.Time)
		}
		t.Logf("leftover %g dB under: G4 first read at %.3f s, alone at %.3f s", under, got.Time, want.Time)
		var entered []Held
		for _, h := range segment(est, rate) {
			if math.Abs(testsignal.Cents(h.Hz, g4)) < 50 {
				entered = append(entered, h)
			}
		}
		if len(entered) != 1 || math.Abs(entered[0].Start-wantNotes[0].Start) > late+1e-9 {
			t.Errorf("leftover %g dB under: G4 notes %+v, alone one from %.3f s", under, entered, wantNotes[0].Start)
		}
	}
}

// A slurred note read at its own first frames is the entering note's, not
// an older sound's, and is tracked. FluidR3's flute (General MIDI program
// 73, Debian's fluidsynth) slurs B5 to D6 in eighths at ♩ = 100, as in the
// legato runs: B5 fades some 10 dB as D6 rises, so the span's ends lie
// entryDB apart only from D6's second frame to its fourth (measured). The
// entry began where D6 first stood out of what the span began with, before
// any frame read it: at each entry frame, every frame that had read D6
// falls within the entry's run. (Counted from where the ends lay entryDB
// apart, D6 was taken for the older sound's pitch, and the fresh readings
// then moved the hops at which the NSDF is refreshed: the legato runs'
// flute C6 after D6 was heard three frames late, 8.5 ¢ from its sound's
// median.)
func TestASlurredNoteReadAtItsFirstFramesIsTracked(t *testing.T) {
	x, _ := fluidPhrase(t, 73, []testsignal.MIDINote{{Key: 83, Seconds: 0.3}, {Key: 86, Seconds: 0.3}})
	d, err := New(48000, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	d6 := 1174.6591            // equal temperament from A4 = 440 Hz (ISO 16)
	lead := d.Span() - d.Hop() // then a frame at every hop
	d.Feed(x[:lead], nil)
	entries := 0
	for x = x[lead:]; len(x) >= d.Hop(); x = x[d.Hop():] {
		before := d.held // the frames read so far
		est := d.Feed(x[:d.Hop()], nil)
		if len(est) != 1 || d.entryRun == 0 || !onePitch(before.hz, d6) {
			continue
		}
		entries++
		if before.frames >= d.entryRun {
			t.Errorf("%.3f s: D6 read for %d frames, the entry began %d frames ago: taken for the older sound's", est[0].Time, before.frames, d.entryRun)
		}
	}
	if entries == 0 {
		t.Error("no frame over D6 held an entry: the slur no longer checks the rule")
	}
	t.Logf("%d entry frames over D6 read at its first frames", entries)
}
