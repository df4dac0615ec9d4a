package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// A held note stays itself over what its channel keeps of a neighbour's
// bleed: a flute's A4 held while a bassoon's D3 and a clarinet's D4 sound
// (the D3's third partial on the A4, both D's partials on D4, two thirds of
// it) read D4 in pieces live before, with 5–9 % of its comb's power in
// D4's series unexplained by A4 and D4's own partial at 0.05–0.5 % (FluidR3,
// one pass with bleed, measured: the fundamentals' bleed is the best
// subtracted). Tones equal-tempered at A4 = 440 Hz (ISO 16); the leftover
// D4 (its fundamental 30 dB under its second partial) 8–12 dB under the
// flute, entering 0.4 s into it. Before, 70 % of the frames from its entry
// on read no pitch.
func TestAHeldNoteIsNotMovedToTheSubharmonicOfABleed(t *testing.T) {
	rate := 48000.0
	flute := testsignal.Spectrum{Name: "flute-like", Amps: []float64{1, 0.35, 0.12, 0.05, 0.02}}
	leftover := testsignal.Spectrum{Name: "leftover bleed", Amps: []float64{0.03, 1, 0.3, 0.6, 0.4, 0.2, 0.3, 0.2}}
	a4, d4 := 440.0, 293.66477
	for _, bleedDB := range []float64{8, 10, 12} {
		n, at := int(1.6*rate), int(0.4*rate)
		x := testsignal.Tone(rate, n-at, flute, 0.3, testsignal.Steady(a4))
		testsignal.FadeIn(x, rate, 0.03)
		x = append(make([]float64, at), x...)
		enters := int(0.8 * rate)
		bleed := testsignal.Tone(rate, n-enters, leftover, 0.3*math.Pow(10, -bleedDB/20), testsignal.Steady(d4))
		testsignal.FadeIn(bleed, rate, 0.03)
		for i, v := range bleed {
			x[enters+i] += v
		}
		began := float64(at)/rate + 0.1 // a window after the flute's onset
		frames, held := 0, 0
		for _, e := range run(t, rate, x) {
			if e.Time <= began {
				continue
			}
			frames++
			switch {
			case !e.Voiced:
			case math.Abs(testsignal.Cents(e.Hz, a4)) > 50:
				t.Errorf("bleed %g dB under: the frame at %.3f s reads %.2f Hz, not the held A4", bleedDB, e.Time, e.Hz)
			default:
				held++
			}
		}
		if held < frames*9/10 {
			t.Errorf("bleed %g dB under: %d of %d frames read the held A4", bleedDB, held, frames)
		}
	}
}

// A held note is read as one from its attack on, wherever the analysis
// frames fall. FluidR3's bassoon (General MIDI 70) G2, D3 and G3, held 2 s
// alone: G2's attack was read at its 5th partial (B4) for 0.1 s and D3's
// as the D4 and A4 of a slur for 0.2 s, at half the offsets of the frames
// against the onset, so that with and without a neighbour's bleed (which
// moves the first voiced frame) a note came out whole or in pieces, and
// its reading 2 ¢ apart (measured). At eight offsets an eighth of a hop
// apart, each key is one held note; its readings agree within 0.6 ¢, and
// lie within 1.5 ¢ of aubio's yin (Debian aubio-tools) over the key's
// steady stretch (0.5–1.7 s after its onset).
func TestABassoonsAttackIsPartOfItsNote(t *testing.T) {
	keys := []int{43, 50, 55}
	x, wav := fluidHeld(t, 70, keys)
	theirs := aubioYinMeans(t, wav, keys)
	lo, hi := make([]float64, len(keys)), make([]float64, len(keys))
	for i := range keys {
		lo[i], hi[i] = math.Inf(1), math.Inf(-1)
	}
	const leadIn = 24000 // 0.5 s of silence first
	for pad := 0; pad < 512; pad += 64 {
		est := run(t, 48000, float64s(append(make([]float32, leadIn+pad), x...)))
		notes := segment(est, 48000)
		if len(notes) != len(keys) {
			for _, h := range notes {
				t.Logf("offset %d: %.3f–%.3f s %.2f Hz", pad, h.Start, h.End, h.Hz)
			}
			t.Errorf("offset %d samples: %d held notes, %d keys", pad, len(notes), len(keys))
			continue
		}
		for i, h := range notes {
			c := testsignal.Cents(h.Hz, theirs[i])
			lo[i], hi[i] = min(lo[i], c), max(hi[i], c)
			if math.Abs(c) > 1.5 {
				t.Errorf("offset %d samples, key %d: %.3f Hz, %+.2f ¢ from aubio's yin", pad, keys[i], h.Hz, c)
			}
		}
	}
	for i, k := range keys {
		t.Logf("key %d: %+.2f to %+.2f ¢ from aubio's yin", k, lo[i], hi[i])
		if hi[i]-lo[i] > 0.6 {
			t.Errorf("key %d: readings %.2f ¢ apart at different offsets", k, hi[i]-lo[i])
		}
	}
}
