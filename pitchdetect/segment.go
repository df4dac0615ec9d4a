package pitchdetect

import (
	"cmp"
	"math"
	"slices"
)

// Held is one held note found in the frame track.
type Held struct {
	Start, End   float64 // seconds: the first and last voiced frame of the note
	Hz           float64 // centre pitch (vibrato centre = mean over whole cycles if vibrato)
	Spread       float64 // cents, standard deviation over the steady part
	VibratoWidth float64 // cents, peak-to-peak; 0 if no vibrato
	VibratoRate  float64 // Hz; 0 if none
	Frames       int
	// Settled is the time of the first frame the reading weighs: past the
	// onset's window and any glide into the pitch.
	Settled float64
}

// Segmenter groups a stream of Estimates into held notes. A note starts on
// a voiced frame, continues while frames stay voiced and within JumpCents of
// the note's recent pitch, and ends after more than MaxGap unvoiced frames
// whose level has fallen (or more than MaxDropout at the note's level: the
// detector losing a frame or two to a wobble is not the player stopping), or
// on a sustained jump. Notes shorter than MinSeconds have no steady part and
// are not held notes; a quiet, attackless echo of the last note at its own
// pitch (a room's reverberation after the player stopped) is not a note. Its steady part leaves out the frames whose analysis
// window may reach past the onset or the offset: a detector voices a frame
// once part of its window holds the note, so the first and last Window
// seconds of voiced frames are set aside. Set the exported fields before
// the first Push.
type Segmenter struct {
	Hop        float64 // seconds between estimates
	Window     float64 // seconds of signal behind each estimate (Detector.Span / rate)
	JumpCents  float64 // a sustained step larger than this starts a new note
	StepCents  float64 // and so does a smaller one this large that holds (step.go); 0: none
	MaxGap     int     // unvoiced frames with a falling level bridged inside a note
	MaxDropout int     // unvoiced frames at the note's level bridged inside a note
	MinFrames  int     // shorter notes are dropped as blips
	MinSeconds float64 // and so are notes shorter than this
	OnsetBlip  float64 // seconds: a note's attack read this briefly a subharmonic low is merged into it
	// Margin, when set, is what each end of a note sets aside from its
	// steady part in place of Window, the end counted from its last frame
	// within releaseDB of its median level: for a reader whose first
	// frame lies at the onset and whose window goes on hearing a release
	// (the multi-pitch estimator's; see the voice tracker in cmd/fifthline).
	Margin float64
	// Reread, when set, reads a past frame again as a pitch, the partials
	// of two others left out (Detector.Reread): a quick slurred note is
	// read through its slurs (reread.go).
	Reread func(at, hz, under, over float64) (f, power float64, ok bool)

	frames  []Estimate
	gap     int      // unvoiced frames since the last voiced one
	dips    int      // of which with the level fallen
	level   float64  // the note's recent level, dBFS
	prev    echoRef  // the last note given out, to know its echo
	outlier Estimate // a single off-pitch frame awaiting confirmation
	from    slurFrom // the note the open one was slurred from; zero after silence
	hasOut  bool
	t, c    []float64 // scratch for summaries
	jt, jc  []float64 // scratch for judging where a note settled
	settles settles   // the open note's, once known
	lohi    []float64 // scratch for glide and released
	vib     vibrato   // the last vibrato fit, made at vibAt frames
	vibAt   int
	vibHz   float64
	nextHz  float64     // the pitch of the note slurred on to, at a finish
	span    []spanFrame // scratch for throughSlurs
	tail    []Estimate  // scratch for stepAt
}

// NewSegmenter returns a Segmenter for estimates hopSeconds apart, with
// defaults suited to the Detector's default window at 44.1 or 48 kHz.
func NewSegmenter(hopSeconds float64) *Segmenter {
	return &Segmenter{
		Hop:        hopSeconds,
		Window:     9 * hopSeconds, // the default span is 9 hops
		JumpCents:  50,
		StepCents:  stepCents,
		MaxGap:     2,
		MaxDropout: 12,
		MinFrames:  4,
		MinSeconds: 0.1,
		OnsetBlip:  0.12,
	}
}

// NewSegmenter returns a Segmenter matched to the detector's hop and span.
func (d *Detector) NewSegmenter() *Segmenter {
	s := NewSegmenter(float64(d.hop) / d.fs)
	s.Window = float64(d.span) / d.fs
	return s
}

// Push adds the next estimate and returns a note that has just ended.
func (s *Segmenter) Push(e Estimate) (Held, bool) {
	if !e.Voiced || e.Hz <= 0 {
		if len(s.frames) == 0 {
			return Held{}, false
		}
		s.gap++
		if e.Level < s.level-dropoutDB {
			s.dips++
		}
		if s.hasOut && e.Level < s.level-dropoutDB {
			// An outlier followed by silence was noise (one followed by a
			// frame missed at the note's level may be a slurred next note).
			s.hasOut = false
		}
		if s.dips > s.MaxGap || s.gap > s.MaxDropout {
			return s.finish(0)
		}
		return Held{}, false
	}
	if len(s.frames) == 0 {
		s.start(e)
		return Held{}, false
	}
	s.gap, s.dips = 0, 0
	if math.Abs(1200*math.Log2(e.Hz/s.recentHz())) <= s.JumpCents {
		s.hasOut = false
		s.add(e)
		if k := s.heldStep(); k > 0 {
			return s.stepAt(k)
		}
		return Held{}, false
	}
	if !s.hasOut || math.Abs(1200*math.Log2(e.Hz/s.outlier.Hz)) > s.JumpCents {
		s.outlier, s.hasOut = e, true // wait for a second frame
		return Held{}, false
	}
	if s.readLow(s.outlier) {
		s.add(s.outlier)
		s.add(e)
		s.hasOut = false
		return Held{}, false
	}
	// Two frames agree on a new pitch: the old note ends, a new one starts.
	first, from, began := s.outlier, s.from, s.frames[0]
	h, ok := s.slurOn(first, first.Hz)
	s.add(e)
	if first.Time-h.Start < s.OnsetBlip && subharmonic(h.Hz, first.Hz) && (!ok || from.hz == 0 || subharmonic(h.Hz, from.hz)) {
		// The attack was heard an octave or a twelfth low: it was this note
		// starting, not a note of its own. A sharp attack after silence can
		// fool the periodicity pick for a few frames, and so can a slur,
		// whose frames hold the end of the last note and the start of this
		// one: together they repeat at the period common to both (G3 for
		// G4 slurred to D5). A quick note of its own a subharmonic below
		// stays a note unless it is too short to be one.
		s.frames[0].Time = began.Time
		s.from = from
		return Held{}, false
	}
	return h, ok
}

// slurOn ends the open note where the note slurred on from it begins, at
// its frame first, and opens that note; nextHz is its pitch.
func (s *Segmenter) slurOn(first Estimate, nextHz float64) (Held, bool) {
	from := s.from
	s.nextHz = nextHz
	h, ok := s.finish(first.Time)
	s.start(first)
	s.from = from // a blip that is no note leaves the slur to the note before it
	if ok {
		s.from = slurFrom{hz: h.Hz, last: h.End} // it follows the old note without a gap
	}
	return h, ok
}

func (s *Segmenter) start(e Estimate) {
	s.from = slurFrom{}
	s.frames = append(s.frames[:0], e)
	s.level = e.Level
	s.gap, s.dips, s.hasOut = 0, 0, false
	s.vib, s.vibAt = vibrato{}, 0
}

// recentHz is the median-of-three of the note's last frames, so a single
// stray frame does not drag the reference.
func (s *Segmenter) recentHz() float64 {
	n := len(s.frames)
	if n < 3 {
		return s.frames[n-1].Hz
	}
	a, b, c := s.frames[n-3].Hz, s.frames[n-2].Hz, s.frames[n-1].Hz
	return max(min(a, b), min(max(a, b), c))
}

// add extends the open note by a voiced frame.
func (s *Segmenter) add(e Estimate) {
	s.frames = append(s.frames, e)
	s.level += (e.Level - s.level) * 0.25 // about the last four frames
}

// dropoutDB: an unvoiced frame this far below the note's level is the note
// fading, not the detector missing a frame.
const dropoutDB = 6

// slurFrom is the note another was slurred from: its pitch and the time of
// its last frame.
type slurFrom struct{ hz, last float64 }

// echoRef is what an echo of a note is told by.
type echoRef struct {
	hz, end, level float64
}

// Echoes: within echoGap seconds of a note's end, at its pitch, starting
// echoDB below its level and never rising.
const (
	echoGap = 0.25
	echoDB  = 6
)

// finish ends the open note; next is the first frame's time of the note
// slurred on from it, or 0 after silence. A note slurred between two others
// lasts from the middle of the slur into it until the next one starts: the
// frames around a slur hold both notes, and the detector gives them to
// neither for a few hops, so in a quick legato passage a note's own frames
// span less than its length. (After silence a note is voiced early, while
// its attack fills part of the window, and needs no such allowance.)
func (s *Segmenter) finish(next float64) (Held, bool) {
	h := s.summarise(false, next)
	h.Hz = s.throughSlurs(h, next)
	length := h.End - h.Start
	if next > 0 && s.from.hz != 0 { // from the middle of the slur into it
		length = next - (h.Start+s.from.last)/2
	}
	minFrames := s.MinFrames
	if next > 0 && s.from.hz != 0 {
		// Slurred between two notes, whose frames around both slurs are
		// often read as neither (a violin's C♯6 sixteenth kept 3: FluidR3,
		// measured): its length from slur to slur says it is a note.
		minFrames--
	}
	ok := len(s.frames) >= minFrames && length >= s.MinSeconds
	first, peak := s.frames[0].Level, s.frames[0].Level
	for _, e := range s.frames {
		peak = max(peak, e.Level)
	}
	if ok && s.from.hz == 0 && h.Start-s.prev.end < echoGap && math.Abs(1200*math.Log2(h.Hz/s.prev.hz)) < s.JumpCents &&
		first < s.prev.level-echoDB && peak <= first+1 {
		ok = false
	}
	if ok {
		s.prev = echoRef{hz: h.Hz, end: h.End, level: peak}
	}
	s.frames = s.frames[:0]
	s.gap, s.dips, s.hasOut = 0, 0, false
	return h, ok
}

// Current returns the note being held now, or false if no note is sounding:
// its start and length, and its pitch, spread and vibrato over the last few
// seconds (liveSeconds) — what the player is doing now. The first reading
// comes with the first voiced frame. Its vibrato fit is refreshed every few
// frames only, so calling it on every frame stays cheap however long the
// note.
func (s *Segmenter) Current() (Held, bool) {
	if len(s.frames) == 0 || s.gap > 0 {
		return Held{}, false
	}
	return s.summarise(true, 0), true
}

// Flush ends the stream, returning the note still open, if long enough.
func (s *Segmenter) Flush() (Held, bool) {
	if len(s.frames) == 0 {
		return Held{}, false
	}
	return s.finish(0)
}

// vibratoRefresh is how many new frames Current waits before refitting;
// liveSeconds is how much of the held note's end it describes.
const (
	vibratoRefresh = 8
	liveSeconds    = 4.0
)

// summarise describes the frames of the open note; live reuses a recent
// vibrato fit; next is the first frame's time of the note slurred on from
// it, 0 if none follows without a gap.
func (s *Segmenter) summarise(live bool, next float64) Held {
	slurred := next > 0
	fr := s.frames
	h := Held{Start: fr[0].Time, End: fr[len(fr)-1].Time, Frames: len(fr)}
	if live {
		// While the note is held, its last few seconds: what the player is
		// doing now, at a cost that does not grow with a long note (a drone
		// exercise may hold one for minutes). A finished note is
		// summarised whole, once.
		i, _ := slices.BinarySearchFunc(fr, h.End-liveSeconds, func(e Estimate, t float64) int { return cmp.Compare(e.Time, t) })
		fr = fr[i:]
	}
	ref := fr[len(fr)/2].Hz
	// Steady part: frames whose whole window lies inside the note. A
	// detector voices a frame once part of its window holds a note, so a
	// note's first and last Window seconds of frames reach past its onset
	// and offset. A slur lies after the old note's last frame (the frames
	// whose window holds both notes are read as neither), and a frame's
	// window reaches half a Window either side of it: the new note's own
	// frames begin half a Window after that frame, and the old note's end
	// half a Window before it. (Ending a Window before it, a quick note
	// whose pitch still moves lost its later frames: FluidR3's violin's
	// high eighths read 6.3 ¢ on average from the median pitch they sound
	// over their length, 3.9 ¢ so; measured.) Margin, where set, replaces
	// the Window at the note's ends.
	// turning: a quick slurred note holding part of a vibrato's cycle.
	lo, hi, turning := s.steadyFrom(fr, h)
	quick := hi // a quick note with none such: to half a Window before a slur
	if slurred {
		quick = h.End - s.Window/2
	}
	i, j := steady(fr, lo, hi, quick)
	// A slurred note with a steady part by the rule above is read on to
	// half a Window before its end, or turning, to its end.
	long := slurred && fr[j-1].Time <= hi
	for long && j < len(fr) && (turning || fr[j].Time <= quick) {
		j++
	}
	// A slurred note whose frames move one way only has no turn of a
	// vibrato in them: it is read on to half a Window before the next
	// note's first frame, as its own frames began half a Window after the
	// last note's. One still drifting there has no settled part: its pitch
	// is the median of those frames, its whole sound's. (Cut half a Window
	// before its own end, a trumpet's sixteenth, rising some 20 ¢ through
	// its length, read its attack: 2–11 ¢ below the median pitch its sound
	// has; FluidR3, measured.) A note's last frame, whose window holds the
	// slur, is pulled toward the next note: one drifting away from it turns
	// back there and is read as before.
	moves := drifts(fr)
	drifting := slurred && moves
	for drifting && j < len(fr) && fr[j].Time <= next-s.Window/2 {
		j++
	}
	s.t, s.c = s.t[:0], s.c[:0]
	for _, e := range fr[i:j] {
		s.t = append(s.t, e.Time)
		s.c = append(s.c, 1200*math.Log2(e.Hz/ref))
	}
	// Whether the note settled after a glide is judged on its frames up to
	// half a Window before its end: a quick note's steady part may end in a
	// vibrato's trough, where half a cycle looks like a settled glide (a
	// violin's 0.3 s C6 read 11 ¢ low: FluidR3, measured). A slurred note
	// read on to there, if its steady part lasts less than the slowest
	// vibrato's cycle, is judged on all its frames: the same C6 settled in
	// a trough five frames long at one phase of the hop, and read 22 ¢ low.
	n := len(s.c)
	until := h.End - s.Window/2
	if long && s.t[n-1]-s.t[0] < 1/vibratoMinRate {
		until = h.End
	}
	for _, e := range fr[j:] {
		if e.Time > until {
			break
		}
		s.c = append(s.c, 1200*math.Log2(e.Hz/ref))
	}
	// The glide may start as late as a note after a rest starts its
	// steady part (a Window, or Margin, after its first frame), past a wobble.
	// A long note's is judged on its first settleSeconds alone (settles.go).
	settled, judged := 0.0, n > 0 && judgedEarly(s.t[0], hi, until)
	var g int
	if judged {
		early := fr[i:][:earlyFrames(fr[i:])]
		g, settled = s.settlesAt(early, s.wobble(early, h.Start))
	} else {
		g = s.glideAfter(fr[i:], s.c, s.wobble(fr[i:j], h.Start))
	}
	if s.c = s.c[:n]; g >= n || turning {
		g = 0
	}
	mean, sd := meanStd(s.c[g:])
	// A slurred note that moves one way and holds only for its last frames,
	// fewer than its glide's, spent most of its sound on the way: a
	// listener's pitch for it is the median of its frames, not the pitch it
	// reached (a trumpet's D4 sixteenth, rising 18 ¢ until just before the
	// next note, read 7 ¢ above the median pitch its sound has; FluidR3,
	// measured). One that holds longer than it glided settled there.
	if drifting && g == 0 || (slurred || s.from.hz != 0) && n-g <= g && moves {
		mean = s.median(s.c)
	}
	h.Spread = sd
	if h.Settled = h.Start; judged {
		h.Settled = settled
	} else if g < n {
		h.Settled = s.t[g]
	}
	h.Hz = ref * math.Pow(2, mean/1200)
	if n := len(s.frames); !live || n >= s.vibAt+vibratoRefresh || n < s.vibAt {
		s.vib, s.vibAt = findVibrato(s.t, s.c, s.Window), len(s.frames)
		if k := 0; !s.vib.ok && !live {
			if s.vib, k = s.lateVibrato(s.t, s.c); s.vib.ok && !judged {
				h.Settled = max(h.Settled, s.t[k])
			}
		}
		s.vibHz = ref * math.Pow(2, s.vib.centre/1200)
	}
	if s.vib.ok {
		h.Hz, h.VibratoWidth, h.VibratoRate = s.vibHz, s.vib.width, s.vib.rate
	}
	return h
}
