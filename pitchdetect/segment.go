package pitchdetect

import "math"

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
	StepHold   float64 // seconds each side of such a step holds
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
	sides   sides       // what each frame's side holds (step.go)
}

// NewSegmenter returns a Segmenter for estimates hopSeconds apart, with
// defaults suited to the Detector's default window at 44.1 or 48 kHz.
func NewSegmenter(hopSeconds float64) *Segmenter {
	return &Segmenter{
		Hop:        hopSeconds,
		Window:     9 * hopSeconds, // the default span is 9 hops
		JumpCents:  50,
		StepCents:  stepCents,
		StepHold:   stepHoldSeconds,
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
		k := s.heldStep()
		if k == 0 && s.StepCents > 0 {
			k = s.vibratoStep()
		}
		if k > 0 {
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
	ok := len(s.frames) >= minFrames && length >= s.MinSeconds || next > 0 && s.slurredNote(h, length)
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
