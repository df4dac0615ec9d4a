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
// D4's series unexplained by A4 (FluidR3, one pass with bleed, measured).
// Tones equal-tempered at A4 = 440 Hz (ISO 16); the bleed steady 10–16 dB
// under the flute (a quiet flute beside louder parts, whose bleed then
// leaves up to 7 % of the A4's comb power on D4's series), which fades in
// over 30 ms once they sound. Before, at 10 dB a fifth of the held frames
// went unvoiced.
func TestAHeldNoteIsNotMovedToTheSubharmonicOfABleed(t *testing.T) {
	rate := 48000.0
	flute := testsignal.Spectrum{Name: "flute-like", Amps: []float64{1, 0.35, 0.12, 0.05, 0.02}}
	a4, d4, d3 := 440.0, 293.66477, 146.83238
	for _, bleedDB := range []float64{10, 12, 16} {
		n, at := int(1.6*rate), int(0.4*rate)
		x := testsignal.Tone(rate, n-at, flute, 0.3, testsignal.Steady(a4))
		testsignal.FadeIn(x, rate, 0.03)
		x = append(make([]float64, at), x...)
		g := math.Pow(10, -bleedDB/20)
		cl := testsignal.Tone(rate, n, testsignal.OddOnly, 0.3*g, testsignal.Steady(d4))
		bn := testsignal.Tone(rate, n, testsignal.WeakFund, 0.3*g*0.6, testsignal.Steady(d3))
		for i := range x {
			x[i] += cl[i] + bn[i]
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
