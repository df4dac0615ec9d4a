package pitchdetect

import (
	"math"
	"slices"
)

// Reading a quick note through its slurs. In a legato passage the frames
// whose window holds the end of one note and the start of the next are
// read as neither (or as the old note, still the louder), so a quick
// note's own frames begin 40–100 ms after it does and end before it stops:
// the part of its sound where its pitch moves most (a violin's attack
// rising into its vibrato, a flute's falling from above, a trumpet's
// rising) goes unread, and its reading is the pitch of its middle alone.
// Its partials are there beside the neighbour's. So the detector keeps each
// recent frame's spectral peaks (phase-advance frequency and power), and
// when a note slurred between two others ends, the segmenter reads every
// frame of the span it sounded again (Reread), in the frames whose window
// reaches a neighbour by the partials not on the neighbour's comb.

const (
	// peakSeconds: the frames kept span a quick note (turningSeconds) and
	// the slurs either side of it when it ends, at any hop.
	peakSeconds = 0.7
	peakKeep    = 24 // strongest peaks kept per frame
	// rereadPartials: a reading from fewer partials of the comb is no
	// series (a lone peak between two notes agrees with anything).
	rereadPartials = 3
)

// peakFrame is one frame's strongest spectral peaks.
type peakFrame struct {
	time    float64
	n       int
	hz, pow [peakKeep]float64
}

// keepPeaks records the strongest peaks of the frame just analysed (its
// spectra computed) under its time.
func (d *Detector) keepPeaks(at float64) {
	if d.noReread {
		return
	}
	if d.peaks == nil {
		d.peaks = make([]peakFrame, int(math.Ceil(peakSeconds*d.fs/float64(d.hop))))
	}
	p := &d.peaks[d.frameNo%len(d.peaks)]
	p.time, p.n = at, 0
	top := int(min(d.ceilHz/d.binHz, float64(len(d.power)-2)))
	for b := 2; b <= top; b++ {
		pb := d.power[b]
		if pb < d.floor || pb < d.power[b-1] || pb < d.power[b+1] {
			continue
		}
		i := p.n
		if i == peakKeep {
			i = slices.Index(p.pow[:], slices.Min(p.pow[:]))
			if p.pow[i] >= pb {
				continue
			}
		} else {
			p.n++
		}
		p.hz[i], p.pow[i] = d.advanceHz(b, float64(b)*d.binHz), pb
	}
}

// mayReread reports whether the frame at time at may yet be read again,
// so that an unvoiced frame needs its spectra only then. The segmenter
// reads again only frames after the last frame of a note (a voiced one)
// and before the first of the note after the quick note slurred from it,
// which lie under 2·turningSeconds apart (spanHz); a hop is added for
// the frame times' rounding. Elsewhere (silence with noise, a resting
// player's channel) a frame the NSDF finds no pitch in costs no FFT.
func (d *Detector) mayReread(at float64) bool {
	return !d.noReread && at-d.voicedAt < 2*turningSeconds+float64(d.hop)/d.fs
}

// NoReread tells the detector that none of its frames will be read again
// (its segmenter has no Reread): it keeps no frame's spectral peaks, and a
// frame with no pitch takes no spectra. Its estimates are the same.
func (d *Detector) NoReread() { d.noReread = true }

// forgetPeaks records the frame just analysed as holding no peaks.
func (d *Detector) forgetPeaks(at float64) {
	if d.peaks != nil {
		d.peaks[d.frameNo%len(d.peaks)] = peakFrame{time: at}
	}
}

// Reread reads the frame of time at again as a note of pitch near hz,
// leaving out the partials that lie on the combs of under and over (the
// notes sounding before and after it; 0 for none): the fundamental on
// which its remaining partials within strayCents of hz's comb agree
// (consensus's grouping), if at least rereadPartials of them do, and the
// power of those partials weighted as the grouping weighs them (times k²).
// Only the last peakSeconds of frames are known.
func (d *Detector) Reread(at, hz, under, over float64) (f, power float64, ok bool) {
	i := slices.IndexFunc(d.peaks, func(p peakFrame) bool { return math.Abs(p.time-at) < 0.25*float64(d.hop)/d.fs })
	if i < 0 || hz <= 0 {
		return 0, 0, false
	}
	p := &d.peaks[i]
	var r, w [maxCandidates]float64
	n := 0
	for k := 1; k <= maxCandidates && float64(k)*hz < d.ceilHz; k++ {
		pred := float64(k) * hz
		best := -1
		for j := range p.n {
			if math.Abs(p.hz[j]-pred) <= pred*strayCents/centsPerUnit && (best < 0 || p.pow[j] > p.pow[best]) {
				best = j
			}
		}
		if best < 0 || onComb(p.hz[best], under) || onComb(p.hz[best], over) {
			continue
		}
		r[n], w[n] = p.hz[best]/float64(k), p.pow[best]*float64(k*k)
		n++
	}
	f, count := agreeing(r[:n], w[:n], agreeCents)
	for j := range n {
		if math.Abs(r[j]-f) <= f*agreeCents/centsPerUnit {
			power += w[j]
		}
	}
	return f, power, count >= rereadPartials
}

// onComb reports whether f lies within strayCents of a partial of f0.
func onComb(f, f0 float64) bool {
	if f0 <= 0 {
		return false
	}
	k := math.Max(1, math.Round(f/f0))
	return math.Abs(f-k*f0) <= k*f0*strayCents/centsPerUnit
}

// agreeing is the weighted mean of the heaviest group of readings r
// (weights w) within tolCents of one of them, and how many it holds.
func agreeing(r, w []float64, tolCents float64) (hz float64, count int) {
	best := 0.0
	for i := range r {
		var sw, swr float64
		m := 0
		for j := range r {
			if math.Abs(r[j]-r[i]) <= r[i]*tolCents/centsPerUnit {
				sw += w[j]
				swr += w[j] * r[j]
				m++
			}
		}
		if sw > best {
			best, hz, count = sw, swr/sw, m
		}
	}
	return hz, count
}
