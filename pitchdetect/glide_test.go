package pitchdetect

import (
	"math"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

// An attack that glides into its pitch is left out of a note's pitch when
// the note settles after it; a vibrato is no glide. The tracks are cents a
// hop apart, shaped like the FluidR3 samples the quick legato runs test in
// cmd/fifthline measures (a trumpet's attack rising 15–20 ¢ over its first
// 0.1 s, an oboe's falling 10 ¢, a clarinet's easing into a 9 ¢ rise; a
// violin's vibrato of about ±12 ¢ at 6 Hz from the start).
func TestGlideRule(t *testing.T) {
	for _, c := range []struct {
		name  string
		track []float64
		glide int
	}{
		{"rise, then steady", []float64{-17, -15, -12, -9, -6, -3.5, -2.3, -1.9, -1.9, -1.7, -1.0, -0.2, 0.2, 0}, 5},
		{"fall, then steady", []float64{6, 5, 4, 3, 2, 1.1, 0.5, 0.1, -0.1, -0.3, -0.5, -0.5, -0.4, -0.2, 0}, 6},
		{"steady", []float64{0.1, 0, -0.1, 0, 0.1, 0, -0.1, 0}, 0},
		{"movement below glideCents", []float64{-2.5, -2, -1.5, -1, -0.5, 0, 0, 0, 0}, 0},
		{"vibrato, swinging back", []float64{-12, -9, -4, 2, 7, 11, 12, 10, 6, 0, -6, -10, -12}, 0},
		{"vibrato, ending on its crest", []float64{-17.9, -14.1, -12.5, -11.6, -7.5, -1.7, 5.4, 7.2, 7.4, 5.1, 0}, 0},
		{"easing in, then steady", []float64{-8.9, -8.7, -8.5, -8.3, -7.9, -7.1, -5.9, -4.3, -2.8, -1.9, -1.5, -1.3, -0.9, -0.5, 0}, 9},
		{"too little after it", []float64{-10, -7, -4, -1, 0}, 0},
		{"a steady drift", []float64{-12, -11, -10, -9, -8, -7, -6, -5, -4, -3, -2, -1, 0}, 0},
		// FluidR3 choir's C4 (voice oohs, General MIDI 53) after a rest,
		// as the detector read it alone (measured): a scoop 30 ¢ sharp,
		// then the note wavering from its first frames. Once the glide
		// reaches the range the rest spans, a step back is the note's own.
		{"scoop, then wavering", []float64{33.8, 31.5, 28.9, 1.7, 2.6, 1.1, -1.4, -3.7, -4.7, -4.7, -4.9, -6.2, -6.9, -7.4, -6.2, -7.4, -7.8, -7.9, -7.4, -5.4, -3.9, -2.9, -2.7, -2.7, -2.3, -1.8, -1.4}, 5},
	} {
		if got := new(Segmenter).glide(c.track, 0); got != c.glide {
			t.Errorf("%s: glide of %d frames, want %d", c.name, got, c.glide)
		}
	}
}

// A 0.3 s note whose pitch rises 18 ¢ linearly over its first 0.12 s and
// then holds reads as the pitch it holds, within 0.5 ¢ (with the glide in
// its mean it read 1.6 ¢ flat: measured), and says its reading settled
// no sooner than 3 ¢ short of the glide's end, at 0.2 s (a chord reads
// the note from there: harmony).
func TestQuickNoteReadsThePitchItSettlesOn(t *testing.T) {
	rate := 48000.0
	hz := 349.2282 // F4, equal temperament from A4 = 440 Hz (ISO 16)
	pitch := func(s float64) float64 {
		return hz * math.Exp2(-18*max(0, 1-s/0.12)/1200)
	}
	x := make([]float64, int(rate*0.6))
	copy(x[int(rate*0.1):], testsignal.Tone(rate, int(rate*0.3), testsignal.Saw, 0.3, pitch))
	notes := segment(run(t, rate, x), rate)
	if len(notes) != 1 {
		t.Fatalf("%d notes, want 1: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[0].Hz, hz); math.Abs(c) > 0.5 {
		t.Errorf("read %+.2f ¢ from the pitch the note settles on", c)
	}
	if n := notes[0]; n.Settled < 0.2 || n.Settled > n.End {
		t.Errorf("settled at %.3f s; the glide is 3 ¢ short of its end at 0.200 s, the note ends at %.3f s", n.Settled, n.End)
	}
}

// A slurred 0.3 s note whose wide vibrato its steady part cuts in a trough
// is no glide: half a cycle there looks like a glide that settled, but the
// note's frames after its steady part rise again. The track is the
// detector's frames of FluidR3's violin C6 slurred from B5 to D6 in a run of
// eighths at ♩ = 100 (fluidsynth, measured; 0 where unvoiced). The note
// reads within 8 ¢ of the mean of its frames (+7.8 ¢ from C6), not in the
// trough (it read −10.0 ¢, 18 ¢ from their mean, with that half cycle taken
// for a glide).
func TestQuickVibratoIsNoGlide(t *testing.T) {
	c6 := 1046.502 // equal temperament from A4 = 440 Hz (ISO 16)
	var track []float64
	for range 24 {
		track = append(track, 966.2) // B5
	}
	track = append(track, 968.39, 970.67, 973.19, 978.17, 0, 0, 0, 0, 0,
		1066.30, 1064.53, 1055.85, 1053.77, 0, 1043.92, 1040.77, 1039.73, 1038.82, 1038.17, 1038.69,
		1040.74, 1043.11, 1047.17, 1050.29, 1054.26, 1060.58, 1063.32, 1063.81, 1062.61, 1057.58, 1053.19,
		0, 0, 0, 0, 0)
	for i := range 24 {
		track = append(track, 1196.6-float64(i)) // D6
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want 3: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[1].Hz, c6); math.Abs(c-7.8) > 8 {
		t.Errorf("read %+.2f ¢ from C6; its frames' mean is +7.8 ¢", c)
	}
}

// A note's attack reads the same whether the note follows a rest or is
// slurred from the note before: the frames of a slurred note's steady part
// begin sooner, on a wobble before the attack's rise, and the rise is still
// left out once the note settles. The track is the detector's frames of
// FluidR3's clarinet (program 71) A4 and then E4, rendered by fluidsynth
// (measured), a hop of 512 samples at 48 kHz apart: the A4's last frames,
// two or three unvoiced frames between the notes (three part them as a
// rest: more than MaxGap with the level fallen), E4's attack wobbling
// about 328.4 Hz, rising 8 ¢ and holding 329.935 Hz. Both read the held
// pitch within 0.05 ¢ (slurred, when the glide test could start only on
// the wobble's first frame, it read 329.68 Hz, 1.35 ¢ flat: measured).
func TestGlideReadsAlikeAfterARestOrASlur(t *testing.T) {
	held := 329.935
	e4 := []float64{330.458, 328.238, 328.289, 328.396, 328.562, 328.684, 328.676, 328.503,
		328.420, 328.395, 328.483, 328.618, 328.719, 328.782, 328.879, 329.021, 329.182,
		329.411, 329.667, 329.850, 329.922}
	for _, rest := range []int{2, 3} {
		var track []float64
		for range 40 {
			track = append(track, 440.267) // A4
		}
		for range rest {
			track = append(track, 0)
		}
		track = append(track, e4...)
		for range 70 {
			track = append(track, held)
		}
		track = append(track, 0, 0, 0, 0)
		s := NewSegmenter(512.0 / 48000)
		s.Window = 4608.0 / 48000
		var notes []Held
		for i, hz := range track {
			level := -28.0
			if hz == 0 {
				level = -90 // the release fallen away
			}
			if h, ok := s.Push(Estimate{Time: float64(i) * 512 / 48000, Hz: hz, Voiced: hz > 0, Level: level}); ok {
				notes = append(notes, h)
			}
		}
		if h, ok := s.Flush(); ok {
			notes = append(notes, h)
		}
		if len(notes) != 2 {
			t.Fatalf("%d unvoiced frames between: %d notes, want 2: %+v", rest, len(notes), notes)
		}
		if c := testsignal.Cents(notes[1].Hz, held); math.Abs(c) > 0.05 {
			t.Errorf("%d unvoiced frames between: E4 read %.3f Hz, %+.2f ¢ from the held %.3f Hz", rest, notes[1].Hz, c, held)
		}
	}
}

// A quick note whose pitch moves on through its whole length has no
// settled part: its pitch is its central one, at every phase of the hop.
// A C6 eighth (0.3 s) slurred from D6 to A5 rises 16 ¢: linearly, or in
// two rises with a pause between, as FluidR3's flute C6 does in such a run
// (fluidsynth, measured: from 6 ¢ flat to its median, held, then easing
// 11 ¢ higher). Here it rises 8 ¢ over its first 0.1 s, holds until
// 0.17 s, then eases 8 ¢ higher (time constant 0.03 s). Delayed by 0, 64,
// … 448 samples it takes each of eight phases of the 512-sample hop, and
// reads within 2 ¢ of its median pitch over its length. (With the last
// frames of the second rise taken for a pitch settled after a glide, the
// pausing note read 6.2–6.6 ¢ sharp of its median at every phase, and the
// flute's C6 8–9 ¢ at six of the eight: measured, its median by aubio's
// yin.)
func TestRisingQuickNoteReadsItsCentreAtEveryHopPhase(t *testing.T) {
	rate := 48000.0
	c6 := 1046.502 // equal temperament from A4 = 440 Hz (ISO 16)
	d6, a5 := c6*math.Exp2(200.0/1200), c6*math.Exp2(-300.0/1200)
	for _, rise := range []struct {
		name  string
		cents func(s float64) float64 // over the note's 0.3 s, from C6
	}{
		{"linearly", func(s float64) float64 { return 16 * s / 0.3 }},
		{"pausing halfway", func(s float64) float64 {
			return 8*min(s/0.1, 1) + 8*max(0, 1-math.Exp(-(s-0.17)/0.03))
		}},
	} {
		pitch := func(s float64) float64 {
			switch {
			case s < 0.3:
				return d6
			case s < 0.6:
				return c6 * math.Exp2(rise.cents(s-0.3)/1200)
			}
			return a5
		}
		var over []float64 // the note's pitch, cents, each ms of its length
		for ms := range 300 {
			over = append(over, rise.cents(float64(ms)/1000))
		}
		slices.Sort(over)
		want := c6 * math.Exp2(over[150]/1200)
		phrase := testsignal.Tone(rate, int(rate*0.9), testsignal.OddOnly, 0.3, pitch)
		for delay := 0; delay < 512; delay += 64 {
			x := make([]float64, int(rate*0.2)+delay, int(rate*1.4)+delay)
			x = append(x, phrase...)
			x = append(x, make([]float64, int(rate*0.3))...)
			notes := segment(run(t, rate, x), rate)
			if len(notes) != 3 {
				t.Fatalf("rising %s, delayed %d samples: %d notes, want D6 C6 A5: %+v", rise.name, delay, len(notes), notes)
			}
			if c := testsignal.Cents(notes[1].Hz, want); math.Abs(c) > 2 {
				t.Errorf("rising %s, delayed %d samples: C6 read %+.2f ¢ from its median pitch", rise.name, delay, c)
			}
		}
	}
}

// The glide rule on the detector's frames of FluidR3's flute (program 73)
// in a run of eighths at ♩ = 100, as summarise judges them (cents from the
// note's middle frame; fluidsynth, measured). E5 slurred from D5 scoops
// 6 ¢ flat after a wobble and settles: the scoop is left out. C6 slurred
// from D6 rises 6 ¢, holds still for five frames, then rises 11 ¢ on to the
// note's end: it never settles, and nothing is left out.
func TestGlideRuleOnAFlutesFrames(t *testing.T) {
	for _, c := range []struct {
		name          string
		track         []float64
		wobble, glide int
	}{
		{"E5: wobble, scoop, settled", []float64{-2.86, -4.59, -5.80, -6.44, -6.55, -6.23, -5.54, -4.60, -3.46, -2.00, -0.79, 0.00,
			0.49, 0.71, 0.53, 0.17, 0.08, 0.23, 0.21, -0.05, -0.34, -0.55, -0.62, -0.61}, 7, 11},
		{"C6: rise, hold, rise on", []float64{-5.68, -4.71, -3.50, -2.26, -1.21, -0.44, 0.02, 0.15, 0.00, -0.09, 0.43,
			2.05, 4.32, 6.50, 8.27, 9.47, 10.26, 10.74, 10.97, 11.03, 11.12}, 5, 0},
	} {
		if got := new(Segmenter).glide(c.track, c.wobble); got != c.glide {
			t.Errorf("%s: glide of %d frames, want %d", c.name, got, c.glide)
		}
	}
}

// A note drifts when its frames move one way only, by glideCents or more,
// never stepping back more than glideSlack (the detector's jitter) from
// the furthest they reached: a rise or a fall, or a glide that comes to
// rest; not a vibrato, which turns back, nor a wavering under glideCents.
// Tracks in cents a hop apart, about A4 (440 Hz).
func TestDriftRule(t *testing.T) {
	for _, c := range []struct {
		name   string
		track  []float64
		drifts bool
	}{
		{"rising through", []float64{-10, -8.5, -7, -5, -3, -1, 1, 3, 5, 7, 8.5, 10}, true},
		{"falling through", []float64{4, 3.9, 3, 1.5, 0, -2.4, -4.5, -5.7, -6.8}, true},
		{"gliding to rest", []float64{-12, -8, -4, -1, 0, 0.2, 0, 0.1, 0}, true},
		{"jitter on the way", []float64{-6, -4, -4.2, -2, 0, -0.25, 2}, true},
		{"vibrato turning back", []float64{-5.7, -2.5, 0.9, 5.6, 10, 11.5, 10.1, 5.5, 1.3, -2.7}, false},
		{"stepping back 1 ¢ at the end", []float64{-9.5, -8, -6, -4, -2, 0, -1}, false},
		{"wavering under glideCents", []float64{0, 0.5, 1, 1.5, 2, 2.5}, false},
	} {
		fr := centsTrack(c.track)
		if got := drifts(fr); got != c.drifts {
			t.Errorf("%s: drifts %v, want %v", c.name, got, c.drifts)
		}
	}
}

// A slurred quick note that rises through most of its length and holds
// only for its last few frames, fewer than its rise took, is read at the
// median of its frames, not at the pitch it reached. The track is the
// detector's frames of FluidR3's trumpet (program 56) D4 sixteenth
// (♩ = 100) slurred from C4 to E♭4, delayed 64 samples (fluidsynth,
// measured; cents from 292.22 Hz, the median of aubio's yin frames over
// the key rendered alone as long, as the quick legato runs test in
// cmd/fifthline reads it): a rise of 18 ¢ over eight frames, four held.
// It reads within 2 ¢ of that median (read at what it reached, it was
// 7.3 ¢ sharp of it: measured).
func TestQuickRiseThatBarelySettlesReadsItsMedian(t *testing.T) {
	median := 292.22
	at := func(c float64) float64 { return median * math.Exp2(c/1200) }
	var track []float64
	for range 20 {
		track = append(track, at(-197)) // C4
	}
	track = append(track, 0, 0, 0, 0, 0)
	for _, c := range []float64{-9.7, -7.5, -5.8, -4.4, -2.3, 0.9, 3.5, 6.0, 7.7, 8.1, 8.1, 8.6} {
		track = append(track, at(c))
	}
	track = append(track, 0, 0)
	for range 20 {
		track = append(track, at(92)) // E♭4
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want C4 D4 E♭4: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[1].Hz, median); math.Abs(c) > 2 {
		t.Errorf("D4 read %+.2f ¢ from the median pitch of its sound", c)
	}
}

// A quick slurred note whose frames turn back, a part of a vibrato's cycle
// or a waver's, is read from its first frame to its last, with no glide left
// out: its pitch is the centre of what it holds, and the half window a
// steady part sets aside at a slur is a good part of what a quick note
// holds. The track is the detector's frames of FluidR3's oboe (program 68)
// D5 eighth (♩ = 100) slurred from B4 to E5 (fluidsynth, measured; cents
// from 588.17 Hz, the median of aubio's yin frames over the key rendered
// alone as long, as the quick legato runs test in cmd/fifthline reads it): a
// fall of 14 ¢ and a rise of 12 ¢. It reads within 1.5 ¢ of that median
// (0.9 ¢ flat; from half a window after the slur to half a window before the
// next it read 3.2 ¢ flat of it: measured).
func TestQuickTurningNoteIsReadWhole(t *testing.T) {
	median := 588.17
	at := func(c float64) float64 { return median * math.Exp2(c/1200) }
	var track []float64
	for range 20 {
		track = append(track, at(-305)) // B4
	}
	track = append(track, at(-1192.3)) // the slur's frame, an octave low
	for _, c := range []float64{6.0, 6.2, 6.1, 4.8, 2.8, 0.9, -0.9, -2.0, -3.3, -4.6, -5.9, -6.9, -7.6, -7.9,
		-7.8, -7.1, -5.9, -4.3, -2.6, -0.3, 1.4, 2.9, 3.7, 3.6, 2.8, 1.5} {
		track = append(track, at(c))
	}
	track = append(track, 0, 0, 0, 0, 0)
	for range 20 {
		track = append(track, at(193.2)) // E5
	}
	notes := pushTrack(track)
	if len(notes) != 3 {
		t.Fatalf("%d notes, want B4 D5 E5: %+v", len(notes), notes)
	}
	if c := testsignal.Cents(notes[1].Hz, median); math.Abs(c) > 1.5 {
		t.Errorf("D5 read %+.2f ¢ from the median pitch of its sound", c)
	}
}

// Frames turn when they rise at least turnCents to one of them and fall as
// far after it, or fall and rise: a vibrato's crest or trough. Tracks in
// cents a hop apart, about A4 (440 Hz).
func TestTurnRule(t *testing.T) {
	for _, c := range []struct {
		name  string
		track []float64
		turns bool
	}{
		{"a crest", []float64{-8, -2, 4, 9, 12, 10, 5, -1}, true},
		{"a trough", []float64{6, 2.8, -0.9, -4.6, -7.6, -7.9, -5.9, -2.6, 1.4, 3.7}, true},
		{"a rise that sags at its end", []float64{-18.7, -14.5, -9.7, -3.4, -0.1, 0.5, 2.3, 1.6, 0.5, -1.7, -3.0}, false},
		{"a glide to rest", []float64{-12, -8, -4, -1, 0, 0.2, 0}, false},
		{"a small waver", []float64{0, 4, 8, 4, 0, -1}, false},
	} {
		fr := centsTrack(c.track)
		if got := turns(fr); got != c.turns {
			t.Errorf("%s: turns %v, want %v", c.name, got, c.turns)
		}
	}
}

// A wobble before a glide may lie on either side of the settled pitch:
// FluidR3's tuba (program 58) G2 slurred from F2 overshoots 29 ¢ and falls
// to its pitch; with a neighbour's bleed in the channel, the frame whose
// window holds its onset read 7 ¢ flat at some phases of the hop (the
// detector's frames, cents from the settled pitch; fluidsynth, four
// channels mixed by sox, measured). Alone that frame is unvoiced and the
// overshoot is left out; so it is with the flat frame before it (with it,
// the note read 3.6 ¢ sharp).
func TestGlideAfterAWobbleOnTheOtherSide(t *testing.T) {
	track := []float64{-7.14, 19.90, 20.31, 29.44, 25.75, 24.26, 23.70, 19.14, 10.48, 3.46, 0.58, 0.11, 0.06,
		0.01, -0.01, -0.03, -0.03, -0.03, -0.03, -0.02, -0.02, -0.02, -0.01, 0.00}
	if got := new(Segmenter).glide(track, 9); got != 9 {
		t.Errorf("glide of %d frames, want 9", got)
	}
	if got := new(Segmenter).glide(track[1:], 8); got != 8 {
		t.Errorf("without the flat frame: glide of %d frames, want 8", got)
	}
}

// centsTrack is the voiced frames of a track in cents from A4, a hop of
// 512 samples at 48 kHz apart.
func centsTrack(cents []float64) []Estimate {
	fr := make([]Estimate, len(cents))
	for i, c := range cents {
		fr[i] = Estimate{Time: float64(i) * 512 / 48000, Hz: 440 * math.Exp2(c/1200), Voiced: true}
	}
	return fr
}
