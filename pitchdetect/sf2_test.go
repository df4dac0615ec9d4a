package pitchdetect

import (
	"math"
	"testing"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
)

// fluid-soundfont-gm (Debian) installs the FluidR3 General MIDI font here.
const fluidR3 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"

// fluidLoops returns up to perInstrument loops for each named instrument.
func fluidLoops(t testing.TB, names []string, perInstrument int) []sf2.Loop {
	t.Helper()
	font := sf2.OpenForTest(t, fluidR3)
	// Long loops (a second or more) are slow to check and wander.
	loops, err := font.Loops(names, perInstrument, 16384)
	if err != nil {
		t.Fatal(err)
	}
	return loops
}

// Instruments of the ensemble in FluidR3: bowed strings, reeds, brass,
// voice, recorder. (Its choir is many voices at once: not one pitch.)
var ensemble = []string{"Cello", "Viola", "Violin", "Contrabass", "Clarinet", "Oboe", "Bassoon",
	"Tenor Sax", "Trumpet", "Trombone", "Tuba", "French Horns", "Ohh Voices", "Recorder"}

// Real timbres: FluidR3 sample loops repeated. A short loop (≤ 2048 frames)
// is one waveform over and over, so every frame has exact truth; a long loop
// carries the player's own wander (several cents), so only its mean over
// whole loops does, and that mean is sampled at the hop: 0.25 ¢ allowed.
func TestSoundFontLoops(t *testing.T) {
	loops := fluidLoops(t, ensemble, 4)
	if len(loops) < 12 {
		t.Fatalf("only %d usable loops", len(loops))
	}
	for _, l := range loops {
		x := testsignal.Repeat(l.Frames, int(2*l.Rate))
		testsignal.Normalize(x, 0.5)
		est := run(t, l.Rate, x)
		m := measure(est, l.Hz)
		mean, ok := meanOverLoops(est, float64(len(l.Frames))/l.Rate, 0)
		c := testsignal.Cents(mean, l.Hz)
		short := len(l.Frames) <= 2048
		if m.gross > 0 || m.voiced < m.frames*3/4 || !ok || math.Abs(c) > 0.25 ||
			(short && (m.median > 0.02 || m.max > 0.2 || m.voiced < m.frames*9/10)) {
			t.Errorf("%s %q (%.3f Hz at %g Hz): %d/%d voiced, %d gross, mean over loops %+.4f ¢, frame median %.4f ¢",
				l.Instrument, l.Sample, l.Hz, l.Rate, m.voiced, m.frames, m.gross, c, m.median)
		} else {
			t.Logf("%s %q %.3f Hz: mean %+.4f ¢, frame median %.4f ¢", l.Instrument, l.Sample, l.Hz, c, m.median)
		}
	}
}

// meanOverLoops is the mean pitch of the voiced frames covering a whole
// number of loop repetitions after the first span (the loop's average
// fundamental is exactly k·R/L even where the recorded pitch wanders).
func meanOverLoops(est []Estimate, loopSeconds, skip float64) (float64, bool) {
	if len(est) == 0 {
		return 0, false
	}
	t0 := est[0].Time + skip
	last := est[len(est)-1].Time
	n := math.Floor((last - t0) / loopSeconds)
	if n < 1 {
		return 0, false
	}
	var sum float64
	count := 0
	for _, e := range est {
		if e.Time >= t0 && e.Time < t0+n*loopSeconds {
			if !e.Voiced {
				continue
			}
			sum += e.Hz
			count++
		}
	}
	return sum / float64(count), count > 0
}
