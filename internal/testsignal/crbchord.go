package testsignal

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// ChordVoice is one voice of a chord for CramerRaoChordHz: its fundamental
// and its partial amplitudes as present in the signal (partial 1 first).
type ChordVoice struct {
	Hz   float64
	Amps []float64
}

// CramerRaoChordHz is the Cramér–Rao bound (standard deviation, Hz) for
// each voice's fundamental when all voices are estimated together from n
// samples at rate in white Gaussian noise of standard deviation sigma: the
// inverse of the Fisher information of the joint model
// x[m] = Σ_v Σ_k A_vk·cos(k·ω_v·m + φ_vk), with every fundamental,
// amplitude and phase unknown (Christensen & Jakobsson, "Multi-Pitch
// Estimation", 2009, from memory; computed here numerically, not from their
// asymptotic form, so partials that nearly coincide raise the bound as they
// should). Partials above 0.45·rate and after the 30th are left out. Where
// two partials coincide exactly their amplitudes cannot be told apart; a
// ridge of a part in 10⁹ keeps the information invertible and leaves the
// fundamentals' bound as it is.
func CramerRaoChordHz(rate float64, n int, voices []ChordVoice, sigma float64) []float64 {
	type partial struct {
		voice, k   int
		amp, phase float64
	}
	var ps []partial
	for v, vc := range voices {
		for k, a := range vc.Amps {
			if kk := float64(k + 1); kk*vc.Hz < 0.45*rate && k < 30 && a > 0 {
				ps = append(ps, partial{v, k + 1, a, 1.3 * kk * kk})
			}
		}
	}
	nv := len(voices)
	p := nv + 2*len(ps)
	fim := mat.NewSymDense(p, nil)
	grad := make([]float64, p)
	data := make([]float64, p*p)
	for m := range n {
		t := float64(m) - float64(n-1)/2 // centred: phase and frequency decouple
		clear(grad[:nv])
		for i, q := range ps {
			w := 2 * math.Pi * voices[q.voice].Hz / rate
			s, c := math.Sincos(float64(q.k)*w*t + q.phase)
			grad[q.voice] -= q.amp * float64(q.k) * t * s
			grad[nv+2*i] = c
			grad[nv+2*i+1] = -q.amp * s
		}
		for i, gi := range grad {
			row := data[i*p:]
			for j := i; j < p; j++ {
				row[j] += gi * grad[j]
			}
		}
	}
	top := 0.0
	for i := range p {
		top = math.Max(top, data[i*p+i])
	}
	for i := range p {
		for j := i; j < p; j++ {
			v := data[i*p+j] / (sigma * sigma)
			if i == j {
				v += 1e-9 * top / (sigma * sigma)
			}
			fim.SetSym(i, j, v)
		}
	}
	var inv mat.Dense
	out := make([]float64, nv)
	if err := inv.Inverse(fim); err != nil {
		for v := range out {
			out[v] = math.Inf(1)
		}
		return out
	}
	for v := range out {
		out[v] = math.Sqrt(math.Max(inv.At(v, v), 0)) * rate / (2 * math.Pi)
	}
	return out
}
