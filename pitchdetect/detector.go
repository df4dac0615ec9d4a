package pitchdetect

import (
	"errors"
	"fmt"
	"math"
	"math/bits"

	"fifthline/internal/rfft"
)

// Estimate is the detector's reading for one analysis frame.
type Estimate struct {
	Time       float64 // seconds from the first sample fed; centre of the analysis window
	Hz         float64 // 0 when unvoiced
	Confidence float64 // 0..1
	Voiced     bool
	Level      float64 // RMS of the window in dBFS (1.0 = full scale; a full-scale sine reads -3.01)
}

// Range of fundamentals searched: a little beyond A0 (27.5 Hz) and C8
// (4186 Hz), the piano's range (common practice).
const (
	MinHz = 26.0
	MaxHz = 4400.0
)

// Voicing thresholds.
const (
	silenceDBFS   = -65.0 // below this the frame is silent and skips the FFTs
	minClarity    = 0.75  // NSDF peak value
	minClarityLow = 0.85  // the same when partials are too close to check their spread
	minShare      = 0.3   // share of spectral power in the harmonic comb
	residualScale = 6.0   // cents of partial disagreement that halve confidence
	// and the same for a note whose fundamental a wide vibrato (sweptCents)
	// sweeps across more than a bin within the window: its partials' readings
	// spread by 4–6 ¢ while the pitch moves (their levels move with it;
	// FluidR3 violin C6–D6, measured), which at 6 left most quick high notes
	// unvoiced.
	residualSwept = 10.0
	sweptCents    = 25.0
	minConfidence = 0.5
	floorDB       = -80.0 // partials this far below the strongest are ignored
	floorMedian   = 20.0  // and partials less than this times the median bin power
	agreeCents    = 8.0   // coarse and fine estimates agree within this (plus lag resolution)
	coarseCents   = 6.0   // trust in the coarse estimate beyond lag resolution
	onsetCents    = 30.0  // the same while a note starts inside the span
	onsetShare    = 0.1   // and the comb's share then
	trackCents    = 6.0   // pitch movement allowed between hops while tracking
	nsdfEvery     = 8     // hops between NSDF runs while a note holds
)

// Detector estimates the pitch of a monophonic stream, one Estimate per hop.
// It is not safe for concurrent use.
type Detector struct {
	fs           float64
	window, hop  int
	lag          int // samples between the two spectral frames
	span         int // window + lag: samples one estimate looks at
	minHz, maxHz float64
	ceilHz       float64 // highest partial frequency used
	binHz        float64
	minLag       int

	ring       []float64
	w          int // next write position in ring
	fed        int // samples fed since Reset
	untilFrame int

	lin    []float64 // the span, oldest first
	win    []float64 // Blackman–Harris window
	wx     []float64 // windowed frame scratch
	fftWin *rfft.FFT
	specA  []complex128
	specB  []complex128
	haveB  bool // specB holds the previous frame's B spectrum

	prevHz    float64  // last frame's pitch, 0 if unvoiced
	held      heldNote // the note the last frames read (guard.go)
	sinceNSDF int      // hops since the NSDF last ran
	clarity   float64  // its clarity then
	nsdfFresh bool     // nsdfOut belongs to this frame
	power     []float64
	scratch   []float64
	fftPad    *rfft.FFT
	padBuf    []float64
	padSpec   []complex128
	nsdfOut   []float64
	floor     float64 // absolute power floor for partial peaks in this frame
	peak      float64 // strongest bin's power in this frame
	last      analysis
}

// New returns a Detector for the sample rate with the given window and hop
// in samples. window 0 picks about 85 ms rounded up to a power of two (4096
// at 44.1 and 48 kHz, 8192 at 96 kHz), long enough for two periods of A0;
// hop 0 picks window/8.
func New(sampleRate float64, window, hop int) (*Detector, error) {
	switch {
	case !(sampleRate >= 8000 && sampleRate <= 384000):
		return nil, fmt.Errorf("pitchdetect: sample rate %g Hz outside 8000..384000", sampleRate)
	case window < 0 || hop < 0:
		return nil, errors.New("pitchdetect: window and hop must not be negative")
	}
	if window == 0 {
		window = 1
		for float64(window) < 0.085*sampleRate {
			window *= 2
		}
	}
	if window < 256 || window > 1<<18 {
		return nil, fmt.Errorf("pitchdetect: window %d outside 256..262144 samples", window)
	}
	if hop == 0 {
		hop = window / 8
	}
	if hop > window {
		return nil, fmt.Errorf("pitchdetect: hop %d longer than window %d", hop, window)
	}
	d := &Detector{fs: sampleRate, window: window, hop: hop, lag: window / 8}
	d.span = window + d.lag
	d.binHz = sampleRate / float64(window)
	d.minHz = math.Max(MinHz, 2*sampleRate/float64(window))
	d.maxHz = math.Min(MaxHz, 0.45*sampleRate)
	d.ceilHz = math.Min(0.45*sampleRate, 16000)
	d.minLag = int(math.Floor(sampleRate / d.maxHz))
	maxLag := min(int(math.Ceil(sampleRate/d.minHz))+2, window/2)

	d.ring = make([]float64, d.span)
	d.lin = make([]float64, d.span)
	d.win = make([]float64, window)
	blackmanHarris(d.win)
	d.wx = make([]float64, window)
	d.fftWin = rfft.New(window)
	d.specA = make([]complex128, window/2+1)
	d.specB = make([]complex128, window/2+1)
	d.power = make([]float64, window/2+1)
	d.scratch = make([]float64, window/2+1)
	// Linear (not circular) correlation up to maxLag needs window+maxLag
	// points; rfft is quickest for a power of two (at 48 kHz 8192 points
	// take a third of the time FFTPACK took for 6144).
	pad := 1 << bits.Len(uint(window+maxLag-1))
	d.fftPad = rfft.New(pad)
	d.padBuf = make([]float64, pad)
	d.padSpec = make([]complex128, pad/2+1)
	d.nsdfOut = make([]float64, maxLag+1)
	d.Reset()
	return d, nil
}

// Reset forgets all samples fed so far; times restart at zero.
func (d *Detector) Reset() {
	clear(d.ring)
	d.w, d.fed = 0, 0
	d.haveB, d.prevHz, d.held = false, 0, heldNote{}
	d.untilFrame = d.span
}

// SampleRate, Window and Hop report the detector's configuration.
func (d *Detector) SampleRate() float64 { return d.fs }
func (d *Detector) Window() int         { return d.window }
func (d *Detector) Hop() int            { return d.hop }

// Span is the number of samples behind each estimate (window plus the lag
// between the two spectral frames); the first estimate comes after Span
// samples, then one per hop.
func (d *Detector) Span() int { return d.span }

// Feed consumes a block of samples and appends one Estimate per completed
// hop to out, returning it. Blocks may have any length. It does not allocate
// when out has room.
func (d *Detector) Feed(block []float32, out []Estimate) []Estimate {
	for len(block) > 0 {
		k := min(d.untilFrame, len(block))
		for _, s := range block[:k] {
			d.ring[d.w] = float64(s)
			d.w++
			if d.w == len(d.ring) {
				d.w = 0
			}
		}
		block = block[k:]
		d.fed += k
		d.untilFrame -= k
		if d.untilFrame == 0 {
			d.untilFrame = d.hop
			out = append(out, d.frame())
		}
	}
	return out
}

// frame analyses the span now in the ring.
func (d *Detector) frame() Estimate {
	n := copy(d.lin, d.ring[d.w:])
	copy(d.lin[n:], d.ring[:d.w])
	e := Estimate{Time: (float64(d.fed) - 0.5*float64(d.span)) / d.fs}
	frameA, frameB := d.lin[:d.window], d.lin[d.lag:]
	e.Level = d.levelDB(frameB)
	if e.Level < silenceDBFS {
		d.haveB = false
		d.read(0)
		return e
	}

	// While a note holds, the last pitch seeds the comb and the NSDF is
	// refreshed only every few hops; it always runs after an unvoiced
	// frame and for low notes, whose final estimate it is.
	tracking := d.prevHz >= resolvedBins*d.binHz && d.sinceNSDF < nsdfEvery
	var period, clarity float64
	if tracking {
		period, clarity = d.fs/d.prevHz, d.clarity
		d.sinceNSDF++
		d.nsdfFresh = false
	} else {
		var ok bool
		period, clarity, ok = pickPeriod(d.nsdf(frameB), d.minLag)
		d.sinceNSDF, d.clarity, d.nsdfFresh = 0, clarity, true
		if !ok || clarity < minClarity/2 {
			e.Confidence = math.Max(clarity, 0)
			d.haveB = false
			d.read(0)
			return e
		}
	}
	if d.haveB && d.hop == d.lag {
		// This frame's A is the previous frame's B: reuse its spectrum.
		d.specA, d.specB = d.specB, d.specA
	} else {
		d.spectrum(frameA, d.specA)
	}
	d.spectrum(frameB, d.specB)
	d.haveB = true
	d.powerSpectrum()

	f, period := d.guard(period)
	lagCents := centsPerUnit * 0.15 / period // parabolic-lag resolution
	if tracking {
		// The seed is the last fine estimate; allow for the pitch moving
		// between hops (a 25 ¢ vibrato at 6.5 Hz moves 6 ¢ a hop).
		lagCents = trackCents
	}
	needClarity, needShare := minClarity, minShare
	onset := false
	var ft fit
	if f >= resolvedBins*d.binHz {
		tol, lobe := coarseCents+lagCents, mainLobeBins
		if onset = d.onsetInSpan(); onset {
			// A note starting inside the span truncates the two frames
			// at different places under their windows, which bends each
			// partial's phase advance, and fills only part of the
			// window, which widens its peaks: accept a rougher comb for
			// the first readings (the segmenter leaves them out of the
			// steady part).
			tol, lobe = onsetCents, max(mainLobeBins, int(f/(2*d.binHz)))
			needShare = onsetShare
		}
		ft = d.fitComb(f, tol, lobe)
		if ft.share < needShare && tracking {
			// The last frame's pitch lags a pitch that moved (see
			// sweep.go). Only while tracking a note: at a note's start the
			// strongest partial may be another's (a choir's bass entering
			// under the other parts' bleed began 0.13 s late). The new
			// comb must find a series (three partials): a lone sine's
			// peak in a slur lies between its two notes.
			if g := d.strongestPartial(f, tol); g > 0 {
				if re := d.fitComb(g, tol, lobe); re.share > ft.share && re.partials >= 3 {
					ft = re
				}
			}
		}
	} else {
		// Partials closer than the window resolves: the comb fit would
		// follow leakage, while the long period makes the NSDF lag
		// precise. The comb (accepting every peak) only gives the share.
		needClarity = minClarityLow
		ft = d.fitComb(f, math.Inf(1), mainLobeBins)
		ft.hz, ft.residual = d.fs/period, 0
	}
	// A tone's comb fit lands within the NSDF's lag resolution of the coarse
	// pick; narrow-band noise drifts between the two analyses.
	tol := agreeCents + lagCents
	hz := ft.hz
	apart := math.Abs(1200 * math.Log2(ft.hz*period/d.fs))
	if apart > tol && !onset && f >= resolvedBins*d.binHz && ft.partials > 0 {
		// A pitch moving within the span (see sweep.go).
		if c, ok := d.centreApart(ft.hz); ok {
			apart = min(apart, c)
		}
	}
	if onset && (apart > tol || lagCents < coarseCents) {
		// The truncated frames bend the comb (by up to its onset search);
		// the NSDF's interpolated lag is the better first reading unless
		// its resolution is coarser still (very high notes).
		hz, tol = d.fs/period, onsetCents+lagCents
	}
	dis := apart / tol
	conf := clarity / (1 + dis*dis)
	if !onset {
		scale := residualScale
		if hz*sweptCents/centsPerUnit > d.binHz {
			scale = residualSwept
		}
		r := ft.residual / scale
		conf *= math.Sqrt(ft.share) / (1 + r*r)
	}
	e.Confidence = math.Max(0, math.Min(conf, 1))
	d.last = analysis{clarity: clarity, fit: ft, disagree: dis, coarseHz: f}
	if hz >= d.minHz && hz <= d.maxHz && clarity >= needClarity && ft.share >= needShare &&
		e.Confidence >= minConfidence && ft.partials > 0 && dis < 1.5 {
		e.Hz, e.Voiced = hz, true
	}
	d.read(e.Hz)
	return e
}

// levelDB is the RMS of x in dB relative to full scale 1.0.
func (d *Detector) levelDB(x []float64) float64 {
	ss := 0.0
	for _, v := range x {
		ss += v * v
	}
	return 10 * math.Log10(ss/float64(len(x))+1e-30)
}

// spectrum windows x and transforms it into dst.
func (d *Detector) spectrum(x []float64, dst []complex128) {
	for i, v := range x {
		d.wx[i] = v * d.win[i]
	}
	d.fftWin.Coefficients(dst, d.wx)
}

// powerSpectrum fills d.power from frame B and sets the partial floor.
func (d *Detector) powerSpectrum() {
	peak := 0.0
	for i, z := range d.specB {
		p := real(z)*real(z) + imag(z)*imag(z)
		d.power[i] = p
		if p > peak {
			peak = p
		}
	}
	d.peak = peak
	copy(d.scratch, d.power)
	d.floor = max(peak*math.Pow(10, floorDB/10), floorMedian*median(d.scratch))
}

// median returns the median of x, reordering x (Hoare's quickselect).
func median(x []float64) float64 {
	k := len(x) / 2
	lo, hi := 0, len(x)-1
	for lo < hi {
		p := x[(lo+hi)/2]
		i, j := lo, hi
		for i <= j {
			for x[i] < p {
				i++
			}
			for x[j] > p {
				j--
			}
			if i <= j {
				x[i], x[j] = x[j], x[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return x[k]
		}
	}
	return x[k]
}

// onsetInSpan reports whether the span's oldest eighth is more than 20 dB
// quieter than its newest: a note has started inside it.
func (d *Detector) onsetInSpan() bool {
	n := len(d.lin) / 8
	var first, last float64
	for i, v := range d.lin[:n] {
		w := d.lin[len(d.lin)-n+i]
		first += v * v
		last += w * w
	}
	return first < 0.01*last
}

// analysis keeps the last voiced-candidate frame's evidence, for tests.
type analysis struct {
	clarity, disagree, coarseHz float64
	fit                         fit
}
