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
	holding   bool     // a note held at the last frame
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
	under     float64     // power of the quieter sound the span began with (entry.go)
	entryRun  int         // frames of an entry so far, this one included (entry.go)
	newest    []float64   // the last frames' newest-eighth powers, a ring (entry.go)
	frameNo   int         // frames since Reset
	ends      [2]float64  // this span's oldest and newest eighths' mean power (entry.go)
	peaks     []peakFrame // the last frames' spectral peaks, a ring (reread.go)
	voicedAt  float64     // the last voiced frame's time, -Inf before one (reread.go)
	noReread  bool        // no frame will be read again (NoReread)
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
	// Frames further back than the span have newest eighths older than
	// the one frame they could be compared with, its oldest eighth.
	d.newest = make([]float64, (d.span+hop-1)/hop)
	d.Reset()
	return d, nil
}

// Reset forgets all samples fed so far; times restart at zero.
func (d *Detector) Reset() {
	clear(d.ring)
	d.w, d.fed = 0, 0
	d.haveB, d.prevHz, d.held = false, 0, heldNote{}
	d.frameNo = 0
	clear(d.peaks)
	d.voicedAt = math.Inf(-1)
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

// frame analyses the span now in the ring, and remembers its pitch for
// the frames after (guard.go).
func (d *Detector) frame() Estimate {
	e := d.analyse()
	d.remember(e.Hz) // 0 unless voiced
	if e.Voiced {
		d.voicedAt = e.Time
	}
	return e
}

// analyse is frame's reading of the span.
func (d *Detector) analyse() Estimate {
	n := copy(d.lin, d.ring[d.w:])
	copy(d.lin[n:], d.ring[:d.w])
	e := Estimate{Time: (float64(d.fed) - 0.5*float64(d.span)) / d.fs}
	d.noteEntry()
	frameA, frameB := d.lin[:d.window], d.lin[d.lag:]
	e.Level = d.levelDB(frameB)
	if e.Level < silenceDBFS {
		d.haveB = false
		d.forgetPeaks(e.Time)
		return e
	}

	// While a note holds, the last pitch seeds the comb and the NSDF is
	// refreshed only every few hops; it always runs after an unvoiced
	// frame, for low notes, whose final estimate it is, and at an entry
	// over a pitch read before it began (entry.go): the quieter sound's.
	tracking := d.prevHz >= resolvedBins*d.binHz && d.sinceNSDF < nsdfEvery && !d.overOlderPitch()
	d.holding = d.prevHz > 0
	if tracking {
		d.sinceNSDF++
		d.nsdfFresh = false
		d.spectra(frameA, frameB)
		d.keepPeaks(e.Time)
		if d.read(&e, d.fs/d.prevHz, d.clarity, true) {
			return e
		}
		// The last pitch only saves the NSDF's time: a frame it leaves
		// unvoiced is read again from its own NSDF. (A quick note's
		// attack moves faster than tracking allows: FluidR3 violin C♯6
		// slurred from B5, measured.)
	}
	period, clarity, ok := pickPeriod(d.nsdf(frameB), d.minLag)
	d.sinceNSDF, d.clarity, d.nsdfFresh = 0, clarity, true
	voiceless := !ok || clarity < minClarity/2
	switch {
	case tracking:
	case !voiceless || d.mayReread(e.Time):
		// Unvoiced too: a frame under a slur may be read again (reread.go).
		d.spectra(frameA, frameB)
		d.keepPeaks(e.Time)
	default:
		d.haveB = false
		d.forgetPeaks(e.Time)
	}
	if voiceless {
		e.Confidence = math.Max(clarity, 0)
		d.prevHz = 0
		return e
	}
	d.read(&e, period, clarity, false)
	return e
}

// read reads the frame's pitch from a coarse period (the NSDF's, or while
// tracking the last pitch's) into e, and reports whether it is voiced.
func (d *Detector) read(e *Estimate, period, clarity float64, tracking bool) bool {
	c := cue{clarity: clarity, needClarity: minClarity, needShare: minShare}
	d.under = d.underlay()
	c.f, c.period = d.guard(period)
	c.lagCents = centsPerUnit * 0.15 / c.period // parabolic-lag resolution
	if tracking {
		// The seed is the last fine estimate; allow for the pitch moving
		// between hops (a 25 ¢ vibrato at 6.5 Hz moves 6 ¢ a hop).
		c.lagCents = trackCents
	}
	if c.resolved = c.f >= resolvedBins*d.binHz; !c.resolved {
		// Partials closer than the window resolves: the comb fit would
		// follow leakage, while the long period makes the NSDF lag
		// precise. The comb (accepting every peak) only gives the share.
		c.needClarity = minClarityLow
		ft := d.fitComb(c.f, math.Inf(1), mainLobeBins, false)
		ft.hz, ft.residual = d.fs/c.period, 0
		return d.judge(e, c, ft)
	}
	tol, lobe := coarseCents+c.lagCents, mainLobeBins
	if c.onset = d.onsetInSpan(); c.onset {
		// A note starting inside the span truncates the two frames at
		// different places under their windows, which bends each
		// partial's phase advance, and fills only part of the window,
		// which widens its peaks: accept a rougher comb for the first
		// readings (the segmenter leaves them out of the steady part).
		tol, lobe = onsetCents, max(mainLobeBins, int(c.f/(2*d.binHz)))
		c.needShare = onsetShare
	}
	ft := d.fitComb(c.f, tol, lobe, false)
	if ft.share < c.needShare && tracking {
		// The last frame's pitch lags a pitch that moved (see sweep.go).
		// Only while tracking a note: at a note's start the strongest
		// partial may be another's (a choir's bass entering under the
		// other parts' bleed began 0.13 s late). The new comb must find a
		// series (three partials): a lone sine's peak in a slur lies
		// between its two notes.
		if g := d.strongestPartial(c.f, tol); g > 0 {
			if re := d.fitComb(g, tol, lobe, false); re.share > ft.share && re.partials >= 3 {
				ft = re
			}
		}
	}
	if d.judge(e, c, ft) || c.onset {
		return e.Voiced
	}
	// A frame the comb leaves unvoiced is read again where its partials
	// agree most, their strays counted while a note holds (see stray.go).
	// Again only a series counts (as the reseed's, above).
	if re := d.fitComb(d.consensus(c.f, tol), tol, lobe, d.holding); re.partials >= 3 {
		return d.judge(e, c, re)
	}
	return false
}

// cue is what a frame's reading is judged by besides its comb.
type cue struct {
	f, period, clarity float64 // the coarse stage's
	lagCents           float64 // how far the coarse period may be off
	needClarity        float64
	needShare          float64
	onset, resolved    bool
}

// judge sets e from the comb fit ft, voiced if ft and the coarse stage agree
// on a pitch clearly enough, and reports whether it is.
func (d *Detector) judge(e *Estimate, c cue, ft fit) bool {
	// A tone's comb fit lands within the NSDF's lag resolution of the coarse
	// pick; narrow-band noise drifts between the two analyses.
	tol := agreeCents + c.lagCents
	hz := ft.hz
	apart := math.Abs(1200 * math.Log2(ft.hz*c.period/d.fs))
	if apart > tol && !c.onset && c.resolved && ft.partials > 0 {
		// A pitch moving within the span (see sweep.go).
		if cents, ok := d.centreApart(ft.hz); ok {
			apart = min(apart, cents)
		}
		// The NSDF weighs the stray partials the fit leaves out.
		apart = min(apart, math.Abs(1200*math.Log2(ft.blend*c.period/d.fs)))
	}
	if c.onset && (apart > tol || c.lagCents < coarseCents) {
		// The truncated frames bend the comb (by up to its onset search);
		// the NSDF's interpolated lag is the better first reading unless
		// its resolution is coarser still (very high notes).
		hz, tol = d.fs/c.period, onsetCents+c.lagCents
	}
	dis := apart / tol
	conf := c.clarity / (1 + dis*dis)
	if !c.onset {
		scale := residualScale
		if d.swept(hz) {
			scale = residualSwept
		}
		r := ft.residual / scale
		conf *= math.Sqrt(ft.share) / (1 + r*r)
	}
	e.Confidence = math.Max(0, math.Min(conf, 1))
	e.Hz, e.Voiced = 0, false
	d.last = analysis{clarity: c.clarity, fit: ft, disagree: dis, coarseHz: c.f}
	d.prevHz = 0
	if hz >= d.minHz && hz <= d.maxHz && c.clarity >= c.needClarity && ft.share >= c.needShare &&
		e.Confidence >= minConfidence && ft.partials > 0 && dis < 1.5 {
		e.Hz, e.Voiced = hz, true
	}
	return e.Voiced
}

// levelDB is the RMS of x in dB relative to full scale 1.0.
func (d *Detector) levelDB(x []float64) float64 {
	ss := 0.0
	for _, v := range x {
		ss += v * v
	}
	return 10 * math.Log10(ss/float64(len(x))+1e-30)
}

// analysis keeps the last voiced-candidate frame's evidence, for tests.
type analysis struct {
	clarity, disagree, coarseHz float64
	fit                         fit
}
