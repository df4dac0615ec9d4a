package multipitch

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/dsp/fourier"
)

// The time average of a voice with vibrato. One fit over a long window
// weighs each moment of a vibrato cycle by how loud the voice is then: a
// FluidR3 violin whose fundamental is loudest at the low end of its cycle
// reads 4 to 7 ¢ flat over a third of a second, where readers of short
// windows (YIN, our one-pitch detector) agree on the cycle's time average.
// So once the long window has found the voices, each is read again on short
// sub-windows, shorter than half a vibrato cycle, with the same joint model
// (Christensen & Jakobsson 2009) started from the long window's fundamentals,
// and the frame's pitch is the plain mean of the sub-windows' readings:
// every moment counts once, however loud. A partial lying within apartBins
// of another voice's is still fitted (its energy explained) but does not
// move the fundamentals: a short window cannot part it.
//
// A voice each of whose partials lies that near a lower voice's (a
// violin's D5 over a cello's G2: its k-th partial k·2.3 Hz from the
// cello's 6k-th, a fifth of a sub-window's bin per partial) would then have
// no sub-window reading and keep the loudness-weighted one (5 ¢ flat in
// the rendered quartet). Such a voice is read again on each sub-window,
// the others held at their readings, steered by the partials it owns the
// larger part of (collide.go: by the long window's fit, whose bins are four
// times finer, and by the lower voice's spectral envelope): the joint
// least-squares fit parts partials a fraction of a bin apart as far as the
// model holds, and the error a mismodelled neighbour (the cello's own
// vibrato within the sub-window) puts into a partial's position grows with
// the neighbour's share of the power, so only the partials where the voice
// has the larger share steer it, and only where they hold most of its
// power (ownShare); otherwise it keeps the long reading. So is a voice
// whose fundamental alone lies on a lower voice's partial 3 or 4 so near
// that the long window cannot part them either (onLowPartial), its upper
// partials parting from that voice's but weak: a flute's G4 14 ¢ over a
// bowed cello's C3's 3rd partial, steered by those alone, read its
// vibrato's troughs, which lie on the partial, 8 to 14 ¢ sharp
// (cmd/fifthline voices_unseen2_test.go's render, measured). A steady
// voice so read lies a few tenths of a cent further from its truth: the
// trio's clarinet D4 over the bassoon's G2's 3rd partial +0.41 ¢ for
// +0.05, the open voicing's horn G4 under the trombone's C3's −0.62 for
// −0.39 (voices_mix_test.go, voices_untuned_test.go; measured).

// A voice whose fundamental lies that near a lower voice's partial 3 to 6
// but far enough from it for the long window's main lobes to part them
// (apartBins of its bins: a flute's E5 21 ¢ over a trombone's C3's 5th
// partial, 8.6 Hz, 3.2 bins of the long window, 0.8 of a sub-window's),
// and whose partials lying apart from every other voice's hold under
// ownShare of its power in the long fit (freeShare: the flute's weak 3rd
// and 4th), keeps the long window's reading: its sub-window fits, steered
// by those alone beside the lower voice's strong partials, read it 0.8 to
// 7 ¢ sharp (that E5 +2.9 ¢ over the note, +1.85 ¢ so; measured on
// voices_untuned_test.go's render). Nearer, the long window cannot part
// them either, and the sub-windows' mean reads as well (a trumpet's C5
// 4.5 Hz under a trombone's F3's 3rd partial: +0.13 ¢, +0.85 from the long
// window).

// apartBins: partials nearer than this to another voice's, in sub-window
// bins, do not steer the sub-window fit (the Hann main lobe's half width).
const apartBins = 2.0

// ownShare: a voice on a lower voice's harmonic is read on sub-windows
// only where the partials it owns the larger part of hold this share of
// its power; otherwise its weak upper partials alone would steer it (a
// flute's G5 over a bassoon's C3, whose strong 6th partial outweighs the
// flute's fundamental, read 2.5 ¢ flat so).
const ownShare = 0.5

// timeAvgCents: a sub-window reading further than this from the long
// window's is not the same voice (a voice silent there, a fit that slipped
// a partial); the widest vibrato read here is about ±50 ¢.
const timeAvgCents = 80.0

// movingCents: a voice whose sub-window readings lie closer together than
// this is steady, and the long window reads it more finely (the sub-windows'
// coarser bins part close partials less well).
const movingCents = 2.0

// pulledCents: a steady voice read on the half window whose sub-windows
// agree within movingCents but whose mean lies further than this from the
// half window's reading was pulled there by a neighbour's partial, and
// reads as their mean (pulled). Chosen between the pull measured on the
// woodwind quartet's bassoon G2 (5.5 ¢, pulled below) and the 2 ¢ its
// sub-windows may spread (movingCents); not tuned further.
const pulledCents = 4.0

// timeAverager reads the voices of a frame on sub-windows; one serves both
// the whole and the half windows of an Estimator.
type timeAverager struct {
	n      int
	frame  []float64
	win    []float64 // hannWindow(n)
	fft    *fourier.FFT
	spec   []complex128
	fitter *fitter
	f0     []float64
	longHz []float64 // per voice: the long window's reading
	// agree and parted (row i, column j, i < j): how many
	// sub-windows read voices i and j within twinCents, and further apart
	// (twins.go).
	agree, parted []int
	order         []int          // scratch of mergeTwins
	merge         []Voice        // scratch of mergeTwins
	long          [][]complex128 // per voice, per partial: the long fit's amplitude
	loose         []bool         // per voice: read by the partials it owns (fitter.loose)
	held          []bool         // per voice: keeps the long reading (freeShare)
	sum           []float64      // per voice: summed cents from the long reading
	lo, hi        []float64      // per voice: the readings' range, cents
	count         []int
	subHop        int
	subsFrame     int // sub-windows per frame
}

// newTimeAverager returns one with sub-windows of the power of two nearest
// rate/11 (4096 at 44.1 and 48 kHz: 85 to 93 ms, under half a cycle of a
// 5–6 Hz vibrato), spaced so that the frames' sub-windows, hop after hop,
// tile time evenly; nil where that window cannot hold the range minHz or
// is not under half the estimator's window.
func newTimeAverager(rate float64, window, hop int, minHz float64) *timeAverager {
	n := 1 << int(math.Round(math.Log2(rate/subDiv)))
	binHz := rate / float64(n)
	if minHz < 2*binHz || n > window/2 {
		return nil
	}
	// Hann sub-windows overlapping by half sum to a constant: the frame's
	// hop is covered by subsFrame of them at n/2 apart.
	subs := max(1, hop/(n/subOverlap))
	ta := &timeAverager{n: n, subHop: hop / subs, subsFrame: subs}
	ta.frame = make([]float64, n)
	ta.fft = fourier.NewFFT(n)
	ta.win = hannWindow(n)
	ta.spec = make([]complex128, n/2+1)
	ta.fitter = newFitter(n, binHz, math.Min(ceilingHz, 0.45*rate), maxPartials)
	ta.fitter.spec = ta.spec
	ta.fitter.apart = apartBins
	return ta
}

// subCaps: the comb grows from the lowest partials, as from candidates: at
// a vibrato's crest a voice lies tens of cents from the long reading, more
// than an upper partial's main lobe.
const subDiv, subOverlap = 11, 2

var subCaps = []int{3, 6, 12, 0, 0}

// sharedCaps: a voice steered by partials beside a lower voice's moves less
// per step (the other partial's column takes part of each), so it is given
// more: measured, subCaps' five steps leave the rendered quartet's D5
// 2.1 ¢ flat and the synthetic one 2.5 ¢
// (TestVibratoReadOverALowerVoicesPartials), these eight 0.9 and 2.2 ¢.
var sharedCaps = []int{3, 3, 3, 6, 6, 12, 0, 0}

// average replaces each voice's Hz by the mean of its readings on the
// sub-windows around the centre of x (the window the voices were read
// from, by long). A voice no sub-window could read, or that they find
// steady (movingCents), keeps its long reading. Twins left by it are one
// voice (mergeTwins): the voices are returned, lowest first.
func (ta *timeAverager) average(x []float64, voices []Voice, long *Estimator) []Voice {
	if ta == nil || len(voices) == 0 {
		return voices
	}
	nv := len(voices)
	ta.sum, ta.count = grow(ta.sum, nv), ta.count[:0]
	ta.agree, ta.parted = grow(ta.agree, nv*nv), grow(ta.parted, nv*nv)
	clear(ta.agree)
	clear(ta.parted)
	ta.loose = ta.loose[:0]
	anyLoose := false
	for range voices {
		ta.count = append(ta.count, 0)
	}
	ta.f0, ta.longHz = ta.f0[:0], ta.longHz[:0]
	for _, v := range voices {
		ta.f0 = append(ta.f0, v.Hz)
		ta.longHz = append(ta.longHz, v.Hz)
	}
	ta.fitter.longBinHz = long.fitter.binHz
	for v := range voices {
		ta.loose = append(ta.loose, ta.fitter.onHarmonic(ta.f0, v) || ta.fitter.onLowPartial(ta.f0, v))
		anyLoose = anyLoose || ta.loose[v]
	}
	ta.takeLong(long, voices)
	ta.held = ta.held[:0]
	anyLoose = false
	for v := range voices {
		ta.loose[v] = ta.loose[v] && ta.fitter.ownShare(ta.f0, v) >= ownShare
		anyLoose = anyLoose || ta.loose[v]
		ta.held = append(ta.held, !ta.loose[v] && ta.fitter.besidePartial(ta.f0, v, apartBins*long.fitter.binHz) && ta.fitter.freeShare(ta.f0, v) < ownShare)
	}
	clear(ta.sum)
	ta.lo, ta.hi = grow(ta.lo, nv), grow(ta.hi, nv)
	for v := range nv {
		ta.lo[v], ta.hi[v] = math.Inf(1), math.Inf(-1)
	}
	first := len(x)/2 - ta.subHop*ta.subsFrame/2 + ta.subHop/2
	for s := range ta.subsFrame {
		lo := first + s*ta.subHop - ta.n/2
		if lo < 0 || lo+ta.n > len(x) || rmsDB(x[lo:lo+ta.n]) < silenceDBFS {
			continue
		}
		hannSpectrum(ta.spec, ta.frame, x[lo:lo+ta.n], ta.win, ta.fft)
		ta.f0 = ta.f0[:0]
		for _, v := range voices {
			ta.f0 = append(ta.f0, v.Hz)
		}
		ta.fitter.refine(ta.f0, -1, subCaps)
		ta.take(voices, false)
		ta.compare(voices)
		if anyLoose {
			// Again from the others' readings, the voices on a harmonic
			// steered too; only theirs are taken from this fit.
			ta.fitter.loose = ta.loose
			ta.fitter.refine(ta.f0, -1, sharedCaps)
			ta.fitter.loose = nil
			ta.take(voices, true)
		}
	}
	for v := range voices {
		if ta.count[v] > 0 && (ta.hi[v]-ta.lo[v] > movingCents || ta.pulled(v, voices[v].Hz, long)) && !ta.held[v] {
			voices[v].Hz *= math.Exp2(ta.sum[v] / float64(ta.count[v]) / 1200)
		}
	}
	return ta.mergeTwins(voices)
}

// take adds the last sub-window fit's reading of each voice that steered
// there and is (loose) or is not read by the partials it owns.
func (ta *timeAverager) take(voices []Voice, loose bool) {
	for v := range voices {
		if c := cents(ta.f0[v], voices[v].Hz); ta.loose[v] == loose && ta.fitter.steers(v) && math.Abs(c) < timeAvgCents {
			ta.sum[v] += c
			ta.lo[v], ta.hi[v] = math.Min(ta.lo[v], c), math.Max(ta.hi[v], c)
			ta.count[v]++
		}
	}
}

// takeLong keeps, per voice, each partial's complex amplitude in long's
// last fit: which voice owns a shared partial (collide.go).
func (ta *timeAverager) takeLong(long *Estimator, voices []Voice) {
	f := long.fitter
	for len(ta.long) < len(voices) {
		ta.long = append(ta.long, make([]complex128, maxPartials+2))
	}
	ta.long = ta.long[:len(voices)]
	for i, v := range voices {
		clear(ta.long[i])
		u := slices.Index(long.f0, v.Hz)
		for c, a := range f.amp {
			if col := &f.cols[c]; u >= 0 && col.voice == u && !col.broad {
				ta.long[i][col.k] = a
			}
		}
	}
	ta.fitter.long = ta.long
}

// pulled reports whether voice v at hz, steady on the sub-windows, was
// pulled off their mean by a neighbour's partial in long, the half window.
// Its bins (5.4 Hz at 44.1 kHz) part a low voice's partial from an upper
// voice's beside it no better than the sub-windows', which leave such a
// partial out of the steering (apartBins): a woodwind quartet's bassoon G2
// has the clarinet's D4 2.8 Hz over its 3rd partial, the oboe's B4 6.6 Hz
// over its 5th and the flute's G5 13.5 Hz over its 8th, and the half window
// read it 11 ¢ sharp where its sub-windows agreed within 0.4 ¢ 5.5 ¢
// lower (voices_untuned_test.go's render, at 1.86 s). Only a voice whose
// own partials make sharp peaks (ownSteady): a chorused voice's
// sub-windows agree so by chance, and the whole window reads it better
// than their mean (the rendered choir's bass F3 read 3.7 → 4.1 ¢ sharp so).
func (ta *timeAverager) pulled(v int, hz float64, long *Estimator) bool {
	mean := ta.sum[v] / float64(ta.count[v])
	return long.avg == nil && math.Abs(mean) > pulledCents && long.ownSteady(hz)
}
