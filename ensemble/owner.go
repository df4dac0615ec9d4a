package ensemble

import (
	"math"
	"math/cmplx"

	"fifthline/internal/rfft"
)

// DefaultOwnDB is how much louder a pitch's harmonics must sound on another
// player's channel for a frame to count as that player's bleed. Close
// microphones hear neighbours 15–25 dB down (the ensemble issue's
// measurements); two players in unison each sound loudest on their own
// channel, within a few dB of each other. 9 dB lies between.
const DefaultOwnDB = 9.0

// ownHarmonics is how many harmonics of a pitch are weighed, and ownBins
// how many FFT bins either side of each: the window's main lobe reaches
// four bins, and a few cents of mistuning between channels stay inside.
const (
	ownHarmonics = 8
	ownBins      = 3
)

// Owner compares how loud a pitch's harmonics sound on each channel over
// the latest analysis window. Load the windows with Set, then ask Power.
// It is a plan made once: no allocation per frame.
type Owner struct {
	fs   float64
	win  []float64
	fft  *rfft.FFT
	buf  []float64
	spec [][]complex128 // per channel, the latest window's spectrum
	have []bool         // spec[c] belongs to the current frame
}

// NewOwner plans the comparison for channels windows of n samples at the
// sample rate fs.
func NewOwner(fs float64, n, channels int) *Owner {
	o := &Owner{fs: fs, win: make([]float64, n), fft: rfft.New(n), buf: make([]float64, n),
		spec: make([][]complex128, channels), have: make([]bool, channels)}
	// Blackman–Harris, 4 terms (Harris, Proc. IEEE 1978): sidelobes 92 dB
	// down, so a loud partial of one player does not leak into the bins
	// where a neighbour's 20 dB quieter bleed is measured.
	for i := range o.win {
		x := 2 * math.Pi * float64(i) / float64(n)
		o.win[i] = 0.35875 - 0.48829*math.Cos(x) + 0.14128*math.Cos(2*x) - 0.01168*math.Cos(3*x)
	}
	for c := range o.spec {
		o.spec[c] = make([]complex128, n/2+1)
	}
	return o
}

// Reset starts a new frame: every channel's spectrum is stale.
func (o *Owner) Reset() { clear(o.have) }

// Set gives channel c's latest window, oldest sample first, in two parts
// as a ring buffer holds it (b may be empty).
func (o *Owner) Set(c int, a, b []float64) {
	n := copy(o.buf, a)
	copy(o.buf[n:], b)
	for i, w := range o.win {
		o.buf[i] *= w
	}
	o.fft.Coefficients(o.spec[c], o.buf)
	o.have[c] = true
}

// Power is the power of the harmonics of hz on channel c in this frame (0
// if Set was not called for c since Reset).
func (o *Owner) Power(c int, hz float64) float64 { return o.power(c, hz, 0) }

// power is Power without the harmonics marked in skip (bit k−1 for k).
func (o *Owner) power(c int, hz float64, skip uint16) float64 {
	if !o.have[c] || !(hz > 0) {
		return 0
	}
	binHz := o.fs / float64(len(o.win))
	spec := o.spec[c]
	p := 0.0
	for k := 1; k <= ownHarmonics; k++ {
		centre := int(math.Round(float64(k) * hz / binHz))
		if centre+ownBins >= len(spec) {
			break
		}
		if skip&(1<<(k-1)) != 0 {
			continue
		}
		for b := max(centre-ownBins, 0); b <= centre+ownBins; b++ {
			p += sqr(cmplx.Abs(spec[b]))
		}
	}
	return p
}

func sqr(x float64) float64 { return x * x }

// unsharedFloorDB is how far below a note's power at all its harmonics the
// power at its unshared ones may lie before they are taken to hold none of
// it: the main lobe's edge of a partial three bins off (Blackman–Harris,
// 4 terms: a₃/2 against a₀, 36 dB down) is all a channel with no partial
// there hears, so below 40 dB the unshared harmonics hold only that.
const unsharedFloorDB = 40

// Bleed tells whether a pitch heard on channel c is another channel's:
// its harmonics sound more than ownDB louder on one of the others, leaving
// out those on the partials of the others' own pitches this frame
// (pitches, by channel; see sharedHarmonics).
//
// When the harmonics left weighed hold nothing of the note on c (below
// unsharedFloorDB of its power at all of them), they are weighed all
// instead, as when every harmonic is shared: a note with few partials
// under a chord has its sounding ones all on the others' partials, and
// the rest hold on c only noise and on a neighbour's channel the edge of
// a partial's main lobe (ownBins+4 bins reach it, the mask only ownBins+2),
// so the note would go as that neighbour's. Measured on four-harmonic
// tones (sox) in a G minor chord: E♭3 under G3 B♭3 D4 weighed only its
// silent 7th and 8th, −80 dB on its own channel against 0 dB on D4's.
func (o *Owner) Bleed(c int, hz float64, pitches []float64, ownDB float64) bool {
	return o.louderElsewhere(c, hz, o.weighedSkip(c, hz, 0, pitches), ownDB)
}

// weighedSkip marks the harmonics of hz that the ownership test leaves out
// (bit k−1 for k): those on the others' own partials (Bleed), or for a
// pitch read below cut Hz (lowband.go; 0: read whole) those at or above
// it, so only the band where no neighbour has a partial is weighed.
func (o *Owner) weighedSkip(c int, hz, cut float64, pitches []float64) (skip uint16) {
	if cut == 0 {
		skip = sharedHarmonics(c, hz, pitches, o.fs/float64(len(o.win)))
		if skip != 0 && o.power(c, hz, skip) < o.power(c, hz, 0)*math.Pow(10, -unsharedFloorDB/10) {
			skip = 0
		}
		return skip
	}
	for k := 1; k <= ownHarmonics; k++ {
		if float64(k)*hz >= cut {
			skip |= 1 << (k - 1)
		}
	}
	return skip
}

// louderElsewhere tells whether the harmonics of hz, less those marked in
// skip, sound more than ownDB louder on another channel than on c.
func (o *Owner) louderElsewhere(c int, hz float64, skip uint16, ownDB float64) bool {
	mine := o.power(c, hz, skip)
	limit := mine * math.Pow(10, ownDB/10)
	for d := range o.spec {
		if d != c && o.have[d] && o.power(d, hz, skip) > limit {
			return true
		}
	}
	return false
}
