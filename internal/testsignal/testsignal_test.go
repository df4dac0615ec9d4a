package testsignal

import (
	"math"
	"testing"
)

func TestReperiodMovesPitchExactly(t *testing.T) {
	// Three cycles of a two-partial wave in 300 samples, reperiodised to
	// 200 samples, must equal the same wave computed directly at 200.
	wave := func(n int) []float64 {
		x := make([]float64, n)
		for i := range x {
			p := 2 * math.Pi * 3 * float64(i) / float64(n)
			x[i] = math.Sin(p+0.3) + 0.5*math.Cos(2*p)
		}
		return x
	}
	got, want := Reperiod(wave(300), 200), wave(200)
	for i := range want {
		if math.Abs(got[i]-want[i]) > 1e-12 {
			t.Fatalf("sample %d: %v, want %v", i, got[i], want[i])
		}
	}
}

func TestCramerRaoMatchesKaySingleSinusoid(t *testing.T) {
	// Kay (1993) eq. 3.41: var(f) ≥ 12/((2π)² η N(N²−1)), η = A²/(2σ²),
	// f in cycles per sample. A = 1, σ = 0.1, N = 1000, rate 1 Hz.
	n := 1000.0
	eta := 1 / (2 * 0.01)
	want := math.Sqrt(12 / (4 * math.Pi * math.Pi * eta * n * (n*n - 1)))
	if got := CramerRaoHz(1, 1000, []float64{1}, 0.1, 0.1); math.Abs(got/want-1) > 1e-9 {
		t.Errorf("CramerRaoHz = %g, want %g", got, want)
	}
}

// One voice alone: the joint bound is the single-voice bound (Kay 1993,
// eq. 3.41, with the harmonic sum; CramerRaoHz). Two voices whose partials
// lie far apart: each keeps its own bound (Christensen & Jakobsson 2009,
// the asymptotic multi-pitch bound). Two voices a just major third apart,
// whose 5th and 4th partials coincide: the bound rises.
func TestCramerRaoChord(t *testing.T) {
	const rate, n, sigma = 44100.0, 4096, 0.01
	amps := []float64{0.2, 0.1, 0.07, 0.05, 0.04}
	single := CramerRaoHz(rate, n, amps, 220, sigma)
	got := CramerRaoChordHz(rate, n, []ChordVoice{{220, amps}}, sigma)
	if math.Abs(got[0]/single-1) > 0.02 {
		t.Errorf("one voice: %g Hz, single-voice bound %g Hz", got[0], single)
	}
	apart := CramerRaoChordHz(rate, n, []ChordVoice{{220, amps}, {220 * 1.4142, amps}}, sigma)
	if math.Abs(apart[0]/single-1) > 0.1 {
		t.Errorf("voices apart: %g Hz, single-voice bound %g Hz", apart[0], single)
	}
	third := CramerRaoChordHz(rate, n, []ChordVoice{{220, amps}, {220 * 1.25, amps}}, sigma)
	if third[0] <= apart[0] {
		t.Errorf("a just third's shared partial does not raise the bound: %g ≤ %g Hz", third[0], apart[0])
	}
}
