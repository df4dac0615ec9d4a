package multipitch

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Voice is one voice heard in a frame.
type Voice struct {
	Hz        float64 // fundamental
	Amplitude float64 // RMS of its partials together, full scale 1
	// Doubled: another voice an octave above it cannot be told apart from
	// its own partials, but stands out of their envelope: both are this one.
	Doubled bool
	// OnPartials: it lies on a lower voice's partials 3k (or 4k, 5k, 6k),
	// which do not stand out of that voice's envelope: likely those
	// partials, not a voice (smoothness.go).
	OnPartials bool
	// Unjudged: it lies on a lower voice's partials, but their envelope
	// could not be read (fewer than two of them clear of the other voices'
	// partials and heard beside neighbours): its frame says nothing either
	// way, OnPartials false for want of evidence.
	Unjudged bool
}

// Frame is the estimator's reading for one hop.
type Frame struct {
	Time   float64 // seconds from the first sample fed; centre of the window
	Span   float64 // seconds the window read covers (half the window: see Feed)
	Level  float64 // RMS of the window in dBFS
	Voices []Voice // lowest first; valid until the next call
}

// Config chooses what the estimator looks for. The zero value hears up to
// four voices from 55 to 2100 Hz.
type Config struct {
	MaxVoices    int     // 1..8; 0 means 4
	MinHz, MaxHz float64 // fundamentals searched; 0 means 55 and 2100 (A1 to about C7)
	// Accept, when set, limits candidates to fundamentals it accepts (a
	// key's window, the chord declared): pruning, not correction.
	Accept func(hz float64) bool
}

const (
	// silenceDBFS: quieter windows hold no voice. The one absolute level
	// here; every other decision is relative to the frame's own spectrum,
	// so that a chord reads the same at any level short of clipping.
	silenceDBFS = -60.0
	// quietest: power per bin this far under the frame's mean (-60 dB) is
	// silence, whatever the spectrum's true floor. A recording's noise lies
	// far above it (35-45 dB SNR spreads to about -40 dB of the mean); a
	// synthetic or digitally quiet one's dither lies far below, where a
	// floor read from it would make leakage of the window a partial and
	// the reading depend on the level above the dither.
	quietest    = 1e-6
	maxPartials = 96
	ceilingHz   = 5000.0
	// A voice must explain this much that the others cannot: κ times the
	// noise its own columns would fit by chance, and relFloor of the
	// chord's energy (-30 dB; the quietest voice of a balanced chord is
	// well above it).
	kappa    = 12.0
	relFloor = 1e-3
	// twinCents: candidates this close while the prune runs are one
	// voice, the weaker dropped (the voices it keeps: unisonCents).
	twinCents = 30.0
)

// Estimator hears several voices in a stream, one Frame per hop. It is not
// safe for concurrent use.
type Estimator struct {
	rate        float64
	window, hop int
	cfg         Config

	buf    []float64 // the window, oldest first
	fill   int
	fed    int
	frame  []float64 // windowed and centred
	win    []float64 // the Hann window (hannWindow)
	fft    *fourier.FFT
	spec   []complex128
	search *searcher
	fitter *fitter
	f0     []float64
	drop   []float64
	trial  []float64
	floor  float64   // the spectrum's median power, no less than quietest of its mean: its noise floor
	sorted []float64 // scratch for it
	out    []Voice
	alt    []Voice       // the half window's reading beside it
	avg    *timeAverager // nil in the half window's own estimator

	// The onset's half window: see onset.go.
	short   *Estimator
	onsetAt int     // sample count fed at the last onset
	full    bool    // a whole window has been read
	last    float64 // time of the last frame emitted

	// The voices' phase relations over frames: see lock.go.
	locks  []lockTrack
	lockOf []int // per voice of the last solve, its track
	// One voice's partial amplitudes and powers and its partials' ratios
	// to their envelope (lock.go, doubled.go): scratch, each good until
	// the next call.
	amps   []complex128
	pows   []float64
	ratios []partialRatio

	// The voices followed (follow.go): heard lately (the whole stream's
	// estimator), the one kept in this frame (0: none); rescued: kept
	// only by following; added and steady: held to its own partials
	// (heldOwn); cands: the candidates as the prune began, and without:
	// the voices it kept without following.
	recent  []heardVoice
	follow  []heardVoice
	kept    float64
	rescued bool
	added   bool
	steady  bool
	cands   []float64
	without []float64
	dropped []float64 // and what that prune dropped
	spare   *fitter   // keep's prune fits here, the prune without it kept
	capped  bool      // that prune dropped a voice over the voices cap
	level   float64   // dBFS: the window read last
}

// New returns an Estimator for the sample rate with window and hop in
// samples: window 0 picks the power of two nearest a third of a second
// (16384 at 44.1 and 48 kHz), long enough to part a just third's coinciding
// partials from a tempered one's; hop 0 picks window/4.
func New(rate float64, window, hop int, cfg Config) (*Estimator, error) {
	if !(rate >= 8000 && rate <= 384000) {
		return nil, fmt.Errorf("multipitch: sample rate %g Hz outside 8000..384000", rate)
	}
	if window < 0 || hop < 0 {
		return nil, errors.New("multipitch: window and hop must not be negative")
	}
	if window == 0 {
		window = 1 << int(math.Round(math.Log2(rate/3)))
	}
	if window < 1024 || window > 1<<19 || window&(window-1) != 0 {
		return nil, fmt.Errorf("multipitch: window %d is not a power of two from 1024 to 524288", window)
	}
	if hop == 0 {
		hop = window / 4
	}
	if hop > window {
		return nil, fmt.Errorf("multipitch: hop %d longer than window %d", hop, window)
	}
	if cfg.MaxVoices == 0 {
		cfg.MaxVoices = 4
	}
	if cfg.MaxVoices < 1 || cfg.MaxVoices > 8 {
		return nil, fmt.Errorf("multipitch: %d voices; 1 to 8 can be heard", cfg.MaxVoices)
	}
	if cfg.MinHz == 0 {
		cfg.MinHz = 55
	}
	if cfg.MaxHz == 0 {
		cfg.MaxHz = 2100
	}
	binHz := rate / float64(window)
	ceil := math.Min(ceilingHz, 0.45*rate)
	if !(cfg.MinHz >= 4*binHz && cfg.MaxHz > cfg.MinHz && cfg.MaxHz < ceil) {
		return nil, fmt.Errorf("multipitch: range %g..%g Hz does not fit a %d-sample window at %g Hz", cfg.MinHz, cfg.MaxHz, window, rate)
	}
	e := &Estimator{rate: rate, window: window, hop: hop, cfg: cfg}
	e.buf = make([]float64, window)
	e.frame = make([]float64, window)
	e.fft = fourier.NewFFT(window)
	e.win = hannWindow(window)
	e.spec = make([]complex128, window/2+1)
	e.search = newSearcher(window/2+1, binHz, ceil, cfg.MinHz, cfg.MaxHz)
	e.fitter = newFitter(window, binHz, ceil, maxPartials)
	e.fitter.spec = e.spec
	e.last = math.Inf(-1)
	if window/2 >= 1024 {
		// A range the half window cannot hold (a low MinHz) has no onset
		// window: chords are then read on whole windows only.
		e.short, _ = New(rate, window/2, hop, Config{MaxVoices: cfg.MaxVoices, MinHz: cfg.MinHz, MaxHz: cfg.MaxHz, Accept: cfg.Accept})
		if e.short != nil {
			e.short.short, e.short.avg = nil, nil
		}
	}
	e.avg = newTimeAverager(rate, window, hop, cfg.MinHz)
	return e, nil
}

// Window and Hop are the analysis window and hop in samples.
func (e *Estimator) Window() int { return e.window }

// Hop is the step between frames in samples.
func (e *Estimator) Hop() int { return e.hop }

// Feed takes the next block of samples and calls emit for every frame it
// completes; the frame's Voices are reused by the next call. Frames come
// every hop once a window is full; until a whole window holds the sound
// since an onset (and at the stream's start) they are read on the newest
// half window instead, so a chord's first reading does not wait for a
// window of it, and a frame whose half window hears more voices than its
// whole one takes the half window's reading (onset.go).
func (e *Estimator) Feed(block []float32, emit func(Frame)) {
	for len(block) > 0 {
		n := min(len(block), e.due()-e.fill)
		for i := range n {
			e.buf[e.fill+i] = float64(block[i])
		}
		e.fill += n
		e.fed += n
		block = block[n:]
		if e.fill < e.due() {
			continue
		}
		if e.fill < e.window { // the stream's start: the half window so far
			e.emitShort(e.buf[e.fill-e.short.window:e.fill], emit)
			continue
		}
		e.full = true
		if e.onset() {
			e.onsetAt = e.fed - e.hop
		}
		if e.short != nil && e.fed-e.onsetAt < e.window {
			e.emitShort(e.buf[e.window-e.short.window:], emit)
		} else if t := (float64(e.fed) - float64(e.window)/2) / e.rate; t > e.last {
			// (The first whole window after the half ones is centred
			// where the last half one was: it is skipped.)
			e.last = t
			emit(e.whole(t))
		}
		copy(e.buf, e.buf[e.hop:])
		e.fill = e.window - e.hop
	}
}

func rmsDB(x []float64) float64 {
	s := 0.0
	for _, v := range x {
		s += v * v
	}
	return 10 * math.Log10(s/float64(len(x))+1e-30)
}

// Analyze reads the voices of one window of samples (len Window()) and
// appends them to dst, lowest first. Successive calls are successive frames
// of one stream: a voice's Doubled mark weighs its partials' phases over
// the recent frames (lock.go).
func (e *Estimator) Analyze(x []float64, dst []Voice) []Voice {
	if e.level = rmsDB(x); len(x) != e.window || e.level < silenceDBFS {
		return dst
	}
	hannSpectrum(e.spec, e.frame, x, e.win, e.fft)
	e.sorted = e.sorted[:0]
	for b := 1; float64(b)*e.fitter.binHz < e.fitter.ceilHz; b += 4 {
		e.sorted = append(e.sorted, real(e.spec[b])*real(e.spec[b])+imag(e.spec[b])*imag(e.spec[b]))
	}
	mean := 0.0
	for _, p := range e.sorted {
		mean += p
	}
	mean /= float64(len(e.sorted))
	slices.Sort(e.sorted)
	e.floor = max(e.sorted[len(e.sorted)/2], quietest*mean)

	e.f0 = e.f0[:0]
	e.search.whiten(e.spec)
	e.search.admit(e.cfg.Accept)
	first := 0.0
	// Two candidates more than the voices asked for: a partial of a loud
	// voice can outweigh a quiet low voice's candidate, and the joint fit
	// tells them apart.
	for try := 0; len(e.f0) < e.cfg.MaxVoices+2 && try < 2*e.cfg.MaxVoices+4; try++ {
		f, s := e.search.next()
		if f == 0 || s < minSalience*first {
			break
		}
		first = math.Max(first, s)
		if slices.ContainsFunc(e.f0, func(g float64) bool { return math.Abs(cents(f, g)) < twinCents }) {
			// What cancellation left of a voice came back: take all of
			// it, so that it cannot crowd out the next voice.
			e.search.clear(f)
			continue
		}
		e.search.cancel(f)
		e.f0 = append(e.f0, f)
	}
	if len(e.f0) == 0 {
		return dst
	}
	follow := e.toFollow()
	e.cands = append(e.cands[:0], e.f0...)
	e.kept, e.rescued, e.capped = 0, false, false
	e.drop = e.drop[:0]
	e.prune()
	if follow > 0 && !slices.ContainsFunc(e.f0, near(follow)) {
		e.keep(follow)
	}
	e.followLocks()
	start := len(dst)
	dst = e.voices(dst)
	e.markPartials(dst[start:])
	return dst
}

// hannSpectrum fills spec with the transform of x under the Hann window
// win (hannWindow(len x)), using frame (len x) as scratch.
func hannSpectrum(spec []complex128, frame, x, win []float64, fft *fourier.FFT) {
	h := len(x) / 2
	for i, v := range x[:h] { // centred, so the window's transform is real
		frame[i+h] = v * win[i]
	}
	for i, v := range x[h:] {
		frame[i] = v * win[i+h]
	}
	fft.Coefficients(spec, frame)
}

// hannWindow is the Hann window of length n as hannSpectrum centres it,
// sample i at i−n/2: computed once, not a cosine per sample per frame.
func hannWindow(n int) []float64 {
	w := make([]float64, n)
	for i := range w {
		c := i - n/2
		w[i] = 0.5 + 0.5*math.Cos(2*math.Pi*float64(c)/float64(n))
	}
	return w
}

func cents(a, b float64) float64 { return 1200 * math.Log2(a/b) }
