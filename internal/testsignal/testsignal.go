// Package testsignal makes the known signals that pitchdetect's tests and the
// fifthbench command measure against: harmonic tones with stated spectra,
// vibrato, white, pink and breath-like noise at a stated SNR, exact pitch
// shifts of a periodic loop, and the Cramér–Rao bound for a harmonic tone.
//
// It is test and benchmark support only: deterministic, in memory, no I/O.
package testsignal

import (
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Spectrum is a named list of partial amplitudes, partial 1 first, and
// optionally their phases (radians of a sine; nil: fixed, unrelated ones).
type Spectrum struct {
	Name   string
	Amps   []float64
	Phases []float64
}

// Spectra used across the accuracy tests. The shapes follow textbook
// instrument acoustics (Fletcher & Rossing, "The Physics of Musical
// Instruments", from memory): a sawtooth's 1/k partials for bowed strings,
// odd partials only for a clarinet's low register, a fundamental far below
// partials 2..5 for bassoon and low brass, and a dominant second partial.
var (
	Sine         = Spectrum{Name: "sine", Amps: []float64{1}}
	Saw          = Spectrum{Name: "saw 1/k", Amps: sawAmps(24)}
	OddOnly      = Spectrum{Name: "odd-only 1/k", Amps: oddAmps(24)}
	WeakFund     = Spectrum{Name: "weak fundamental -26 dB", Amps: []float64{0.05, 1, 0.8, 0.6, 0.5, 0.3, 0.2, 0.15, 0.1, 0.05}}
	StrongSecond = Spectrum{Name: "strong 2nd partial", Amps: []float64{0.3, 1, 0.1, 0.35, 0.05, 0.15, 0.03, 0.08}}
	All          = []Spectrum{Sine, Saw, OddOnly, WeakFund, StrongSecond}
)

func sawAmps(n int) []float64 {
	a := make([]float64, n)
	for k := range a {
		a[k] = 1 / float64(k+1)
	}
	return a
}

func oddAmps(n int) []float64 {
	a := make([]float64, n)
	for k := 0; k < n; k += 2 {
		a[k] = 1 / float64(k+1)
	}
	return a
}

// Tone renders a harmonic tone of n samples whose instantaneous fundamental
// is hz(t) (t in seconds), partials above 0.45·rate dropped, peak-normalised
// to level (linear). Phases start at the spectrum's, else at fixed,
// unrelated values.
func Tone(rate float64, n int, s Spectrum, level float64, hz func(t float64) float64) []float64 {
	x := make([]float64, n)
	phase := 0.0 // cycles of the fundamental
	for i := range x {
		t := float64(i) / rate
		f := hz(t + 0.5/rate) // midpoint rule for the phase integral
		v := 0.0
		for k, a := range s.Amps {
			kk := float64(k + 1)
			if a == 0 || kk*f > 0.45*rate {
				continue
			}
			v += a * math.Sin(2*math.Pi*kk*phase+s.phase(k))
		}
		x[i] = v
		phase += f / rate
		if phase > 1<<20 {
			phase = math.Mod(phase, 1)
		}
	}
	Normalize(x, level)
	return x
}

// phase is partial k+1's starting phase.
func (s Spectrum) phase(k int) float64 {
	if k < len(s.Phases) {
		return s.Phases[k]
	}
	return 1.3 * float64((k+1)*(k+1))
}

// Steady is a constant fundamental.
func Steady(hz float64) func(float64) float64 { return func(float64) float64 { return hz } }

// Vibrato is a sinusoidal vibrato about centre hz, widthCents peak to peak,
// at rateHz: the log-frequency mean over whole cycles is exactly hz.
func Vibrato(hz, widthCents, rateHz float64) func(float64) float64 {
	return func(t float64) float64 {
		return hz * math.Pow(2, widthCents/2*math.Sin(2*math.Pi*rateHz*t)/1200)
	}
}

// Normalize scales x to the given peak absolute value.
func Normalize(x []float64, peak float64) {
	m := 0.0
	for _, v := range x {
		m = math.Max(m, math.Abs(v))
	}
	if m == 0 {
		return
	}
	for i := range x {
		x[i] *= peak / m
	}
}

// RMS is the root mean square of x.
func RMS(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v * v
	}
	return math.Sqrt(s / float64(max(len(x), 1)))
}

// White is Gaussian white noise of unit variance.
func White(r *rand.Rand, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = r.NormFloat64()
	}
	return x
}

// Pink is white noise through Paul Kellett's "refined" -3 dB/octave filter
// (music-dsp mailing list, 1999; coefficients from memory).
func Pink(r *rand.Rand, n int) []float64 {
	x := make([]float64, n)
	var b0, b1, b2, b3, b4, b5, b6 float64
	for i := range x {
		w := r.NormFloat64()
		b0 = 0.99886*b0 + w*0.0555179
		b1 = 0.99332*b1 + w*0.0750759
		b2 = 0.96900*b2 + w*0.1538520
		b3 = 0.86650*b3 + w*0.3104856
		b4 = 0.55000*b4 + w*0.5329522
		b5 = -0.7616*b5 - w*0.0168980
		x[i] = b0 + b1 + b2 + b3 + b4 + b5 + b6 + w*0.5362
		b6 = w * 0.115926
	}
	return x
}

// Breath is white noise through a band-pass biquad at centre Hz with
// quality q (RBJ audio EQ cookbook, constant 0 dB peak gain; from memory):
// the hiss of breath or bow noise without a pitch.
func Breath(r *rand.Rand, n int, rate, centre, q float64) []float64 {
	w0 := 2 * math.Pi * centre / rate
	alpha := math.Sin(w0) / (2 * q)
	a0 := 1 + alpha
	b0, b2 := alpha/a0, -alpha/a0
	a1, a2 := -2*math.Cos(w0)/a0, (1-alpha)/a0
	x := make([]float64, n)
	var x1, x2, y1, y2 float64
	for i := range x {
		w := r.NormFloat64()
		y := b0*w + b2*x2 - a1*y1 - a2*y2
		x2, x1 = x1, w
		y2, y1 = y1, y
		x[i] = y
	}
	return x
}

// AddNoise adds noise scaled so that RMS(signal)/RMS(noise) is snrDB, and
// returns the noise standard deviation used.
func AddNoise(signal, noise []float64, snrDB float64) float64 {
	g := RMS(signal) / RMS(noise) / math.Pow(10, snrDB/20)
	for i := range signal {
		signal[i] += g * noise[i]
	}
	return g * RMS(noise)
}

// Float32 converts to the detector's input type.
func Float32(x []float64) []float32 {
	y := make([]float32, len(x))
	for i, v := range x {
		y[i] = float32(v)
	}
	return y
}

// CramerRaoHz is the Cramér–Rao bound (standard deviation, Hz) for the
// fundamental of a harmonic tone with real partial amplitudes amps (as
// present in the signal, linear), in white Gaussian noise of standard
// deviation sigma, observed for n samples at rate: var(ω0) ≥ 24σ² /
// (n(n²−1)·Σ k²A_k²) in rad²/sample². For one partial this is Kay,
// "Fundamentals of Statistical Signal Processing I" (1993), eq. 3.41; the
// harmonic sum is Christensen & Jakobsson, "Multi-Pitch Estimation" (2009),
// from memory.
func CramerRaoHz(rate float64, n int, amps []float64, f0, sigma float64) float64 {
	s := 0.0
	for k, a := range amps {
		kk := float64(k + 1)
		if kk*f0 > 0.45*rate {
			continue
		}
		s += kk * kk * a * a
	}
	nn := float64(n)
	v := 24 * sigma * sigma / (nn * (nn*nn - 1) * s)
	return math.Sqrt(v) * rate / (2 * math.Pi)
}

// Cents is 1200·log2(a/b).
func Cents(a, b float64) float64 { return 1200 * math.Log2(a/b) }

// FadeIn shapes the first seconds of x with a raised-cosine attack, as any
// bowed, blown or sung onset has; a hard step would add a click no
// instrument makes.
func FadeIn(x []float64, rate, seconds float64) {
	n := min(int(rate*seconds), len(x))
	for i := range n {
		x[i] *= 0.5 - 0.5*math.Cos(math.Pi*float64(i)/float64(n))
	}
}

// FadeOut shapes the last seconds of x with a raised-cosine release, the
// mirror of FadeIn.
func FadeOut(x []float64, rate, seconds float64) {
	slices.Reverse(x)
	FadeIn(x, rate, seconds)
	slices.Reverse(x)
}

// Repeat plays one period over and over for n samples.
func Repeat(period []float64, n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = period[i%len(period)]
	}
	return x
}

// Reperiod resamples one period of a periodic signal to newLen samples by
// moving its DFT coefficients to a transform of the new length (partials
// above the new Nyquist frequency dropped): played at the same rate, the
// pitch moves by exactly len(period)/newLen, 1200·log2(len/newLen) cents.
func Reperiod(period []float64, newLen int) []float64 {
	n := len(period)
	c := fourier.NewFFT(n).Coefficients(nil, period)
	d := make([]complex128, newLen/2+1)
	top := min(len(c), len(d))
	if 2*(top-1) == min(n, newLen) {
		top-- // a Nyquist bin does not carry over between lengths
	}
	copy(d, c[:top])
	y := fourier.NewFFT(newLen).Sequence(nil, d)
	for i := range y {
		y[i] /= float64(n)
	}
	return y
}
