package pitchdetect

import "math"

// blackmanHarris fills w with the 4-term Blackman–Harris window (Harris 1978,
// "On the use of windows for harmonic analysis with the DFT", Proc. IEEE 66,
// table 1: a0..a3 = 0.35875, 0.48829, 0.14128, 0.01168). Its -92 dB side
// lobes keep a partial's phase free of its neighbours' leakage, which the
// phase-advance refinement relies on. The window is periodic (DFT-even).
func blackmanHarris(w []float64) {
	n := float64(len(w))
	for i := range w {
		x := 2 * math.Pi * float64(i) / n
		w[i] = 0.35875 - 0.48829*math.Cos(x) + 0.14128*math.Cos(2*x) - 0.01168*math.Cos(3*x)
	}
}

// mainLobeBins is the half-width of the Blackman–Harris main lobe in bins.
const mainLobeBins = 4
