package main

import (
	"cmp"
	"math"
	"slices"
	"strconv"
	"time"

	"fifthline/harmony"
	"fifthline/journal"
	"fifthline/multipitch"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// voiceNote is a held note of one voice; voice 1 is the lowest sounding at
// the note's start. doubled: in most of its frames another voice sounded an
// octave above it, inseparably (multipitch.Voice.Doubled).
type voiceNote struct {
	session.Event
	voice   int
	doubled bool
	frames  *harmony.Track // its track's frames, kept for --chords; else nil
	heard   time.Time      // when its end was heard live (heldRows)
}

// voiceColumns follow the held-note columns.
var voiceColumns = []string{"voice", "doubled"}

// voiceChordHeader is the chord rows' header with --voices: the voice,
// then doubled, as on the note rows.
func voiceChordHeader(withFile bool) []string { return append(chordHeader(withFile), "doubled") }

// voiceNoteJSON is a voice's note in JSON: the note's fields and the voice's.
type voiceNoteJSON struct {
	noteJSON
	Voice   int  `json:"voice"`
	Doubled bool `json:"doubled"`
}

func (n voiceNote) json(withFile bool) voiceNoteJSON {
	return voiceNoteJSON{newNoteJSON(n.Event, withFile), n.voice, n.doubled}
}

// record is the note's CSV record with its voice columns.
func (n voiceNote) record(withFile bool) []string {
	return append(n.Record(withFile), strconv.Itoa(n.voice), strconv.FormatBool(n.doubled))
}

// extra is the note's journal columns: its voice.
func (n voiceNote) extra() journal.Extra { return journal.Extra{Voice: strconv.Itoa(n.voice)} }

// tracker follows the estimator's voices from frame to frame: each voice
// continues the track whose pitch it stays within the segmenter's jump of,
// and each track is a pitchdetect.Segmenter, so a voice's held notes follow
// the same rules as a single player's.
type tracker struct {
	name        string
	tuning      func() target.Tuning // in force as each note ends
	hop, window float64
	tracks      []*track
	done        []doneNote // notes given out lately, to number voices by
	emit        func(voiceNote)
	waiting     []voiceNote // notes given out, waiting for a lost voice's (give)
	keepFrames  bool        // for reading chords: each track's frames
	most        int         // the most voices numbered (--voices N); 0: heardVoices
	fed         []*track    // the track each voice of the last frame went to
	aside       []float64   // the voices --voices N left out of the frame pushed (voicelost.go)
}

type track struct {
	seg     *pitchdetect.Segmenter
	hz      float64
	start   float64 // its first frame
	count   int     // frames fed
	doubled int     // frames marked doubled
	partial int     // frames marked on a lower voice's partials
	// unjudged: frames on a lower voice's partials whose envelope could
	// not be read (multipitch.Voice.Unjudged), which onPartials leaves out
	unjudged int
	// partialCents: how far those frames lie from the partial, summed
	partialCents float64
	power        float64 // its frames' power (amplitude squared), summed
	missed       int     // frames in a row without its voice
	frames       *harmony.Track
	ended        float64 // its last note's end: its next note starts after it
	// delivered: its note is among tr.done (then it is not counted twice)
	delivered bool
	// stepped: its last note ended at a step its voice held through
	// (pitchdetect/step.go), so the voice sounds on in its next note;
	// from: where the held note it sounds began (heldFrom), or +Inf
	// after a note it did not hold through: its next frame's time
	stepped bool
	from    float64
	notes   int        // notes delivered
	gone    bool       // ended: no longer among tr.tracks
	lost    *lostVoice // its voice missing under a chord that holds; else nil
}

func newTracker(name string, tuning func() target.Tuning, hop, window float64, emit func(voiceNote)) *tracker {
	return &tracker{name: name, tuning: tuning, hop: hop, window: window, emit: emit}
}

// push takes one frame's voices (lowest first).
func (tr *tracker) push(f multipitch.Frame) {
	taken := make([]bool, len(f.Voices))
	tr.fed = make([]*track, len(f.Voices))
	// Nearest pairs first, so two voices a semitone apart keep their tracks.
	type pair struct {
		t, v  int
		cents float64
	}
	var pairs []pair
	for ti, t := range tr.tracks {
		for vi, v := range f.Voices {
			if c := math.Abs(1200 * math.Log2(v.Hz/t.hz)); c <= t.seg.JumpCents && tr.resumes(t, v.Hz) {
				pairs = append(pairs, pair{ti, vi, c})
			}
		}
	}
	slices.SortFunc(pairs, func(a, b pair) int { return cmp.Compare(a.cents, b.cents) })
	got := make([]bool, len(tr.tracks))
	for _, p := range pairs {
		if got[p.t] || taken[p.v] {
			continue
		}
		got[p.t], taken[p.v] = true, true
		tr.fed[p.v] = tr.tracks[p.t]
		tr.feed(tr.tracks[p.t], f.Time, f.Voices, p.v)
	}
	var kept []*track // a new slice: deliver reads tr.tracks meanwhile
	for ti, t := range tr.tracks {
		if !got[ti] && !tr.stillLost(t, f.Time, got) && !tr.missing(t, f.Time) {
			continue
		}
		kept = append(kept, t)
	}
	tr.tracks = kept
	for vi, v := range f.Voices {
		if !taken[vi] {
			s := pitchdetect.NewSegmenter(tr.hop)
			s.Window = tr.window
			// A note's first frame is the estimator's onset half window,
			// centred near the onset (multipitch/onset.go), and its last
			// is heard while the whole window's share of the note still
			// explains a voice: half a window at each end sets aside the
			// frames reaching past it. Measured: a whole window trimmed
			// the rendered clarinet's last 0.2 s, which falls 5 ¢, from
			// its reading but not from its truth's (+0.62 ¢; +0.11 so).
			s.Margin = tr.window / 2
			// A held step ends a voice's note as a player's (StepCents,
			// pitchdetect/step.go), each side held over four frames
			// (3.5 hops). Its 0.25 s, three frames here, let a bowed
			// vibrato pass for a step: a hop is about half its cycle, so
			// the frames alternate crest and trough and their beat holds
			// either for a while (a lone FluidR3 violin's D5, ±13 ¢, split
			// 22 ¢ above and 4 ¢ under its pitch; measured). Four frames:
			// sox sawtooths over a held C4 or E3 stepping the lesser
			// diesis or 30 ¢, either way, are two notes within 0.03 ¢, a
			// 20 ¢ step and a ±40 ¢ vibrato at 5.5 Hz one, the violin's D5
			// one at four shifts of the frame grid and at 48 kHz.
			s.StepHold = 3.5 * tr.hop
			t := &track{seg: s, hz: v.Hz, start: f.Time, from: tr.heldFrom(v.Hz, f.Time)}
			if tr.keepFrames {
				t.frames = &harmony.Track{}
			}
			tr.tracks = append(tr.tracks, t)
			tr.fed[vi] = t
			tr.feed(t, f.Time, f.Voices, vi)
		}
	}
	tr.release()
}

// feed gives track t voice i of a frame's voices vs.
func (tr *tracker) feed(t *track, at float64, vs []multipitch.Voice, i int) {
	v := vs[i]
	t.from = min(t.from, at)
	t.hz, t.missed, t.lost = v.Hz, 0, nil
	t.count++
	t.power += v.Amplitude * v.Amplitude
	if t.frames != nil {
		t.frames.Add(at, v.Hz)
	}
	if v.Doubled {
		t.doubled++
	}
	if v.Unjudged {
		t.unjudged++
	}
	if v.OnPartials {
		t.partial++
		t.partialCents += partialOffset(vs, v.Hz)
	}
	e := pitchdetect.Estimate{Time: at, Hz: v.Hz, Confidence: 1, Voiced: true, Level: 20 * math.Log10(v.Amplitude+1e-12)}
	if h, ok := t.seg.Push(e); ok {
		tr.deliver(t, h, true) // a voiced frame ended it: the voice holds on
	}
}

// flush ends every track at the end of the stream.
func (tr *tracker) flush() {
	for _, t := range tr.tracks {
		if !tr.missing(t) {
			continue
		}
		if h, ok := t.seg.Flush(); ok {
			tr.deliver(t, h, false)
		}
	}
	tr.tracks = nil
	tr.release()
}

// deliver gives out note h of track t, stepped where its voice holds on
// past a step into its next note.
func (tr *tracker) deliver(t *track, h pitchdetect.Held, stepped bool) {
	if h.VibratoRate*tr.window > 1 {
		// A vibrato faster than one cycle a window is mostly averaged away
		// inside each frame; scaling what is left back up (the segmenter
		// knows its window) gives nonsense widths. Its centre stands.
		h.VibratoWidth, h.VibratoRate = 0, 0
	}
	t.ended, t.notes = h.End, t.notes+1
	from := t.from
	if t.stepped = stepped; !stepped {
		t.from = math.Inf(1)
	}
	// A note most of whose frames lie on a lower voice's partials, which
	// stand no higher than that voice's envelope allows, is those partials
	// (multipitch.Voice.OnPartials): no voice either; so is a quieter
	// note surfacing on a held note's partial (voicesurfaced.go), and a
	// voice's attack read an octave low (voiceattack.go).
	if tr.foldOctave(t, h) || t.onPartials() || tr.surfaced(t, h) || tr.attackBelow(t, h) {
		t.delivered = true // no voice: not counted as one either
		return
	}
	voice := tr.voiceAt(t, h.Start, h.Hz)
	t.delivered = true
	tr.done = append(slices.DeleteFunc(tr.done, func(d doneNote) bool { return d.End < h.Start-60 }), doneNote{h, t.level(), from})
	tu := tr.tuning()
	tr.give(voiceNote{session.Event{Source: tr.name, Held: h, Reading: tu.Classify(h.Hz), Tuning: tu}, voice, 2*t.doubled > t.count, t.frames, time.Time{}})
}

// voiceAt is the number of track t's note beginning at start at pitch hz.
// Voice 1 is the lowest sounding at the note's start: among the notes
// given out and the tracks held long enough to be notes, not the passing
// readings of an onset. Voices struck together are heard a hop or two
// apart; within half a window they count as sounding at the note's start.
func (tr *tracker) voiceAt(t *track, start, hz float64) int {
	together := tr.window / 2
	var below []span
	for _, d := range tr.done {
		if d.Start <= start+together && d.End >= start && d.Hz < hz {
			below = append(below, span{d.Start, d.End})
		}
	}
	for _, o := range tr.tracks {
		if o != t && !o.delivered && o.start <= start+together && o.count >= o.seg.MinFrames && o.hz < hz && !o.onPartials() {
			below = append(below, span{o.start, math.Inf(1)})
		}
	}
	return tr.numbered(below, start, together)
}

// doneNote is a note given out, with its track's mean power and where
// the held note it belongs to began (track.from).
type doneNote struct {
	pitchdetect.Held
	power, from float64
}

// onPartials: most of the track's frames judged lie on a lower voice's
// partials, on the partial itself as their mean (partialNoteCents). A
// frame whose envelope could not be read (multipitch.Voice.Unjudged) is no
// evidence either way. Measured on voices_untuned_test.go's three quick
// chords: the oboe's B4's 3rd partial, read as F#6 within 14 ¢ of it, was
// marked in 6 of its 13 frames and unjudged in the other 7 (the bassoon's
// G3's 5th and 10th partials beside B4's 2nd and 4th leave B4's 3rd no
// neighbour to be judged against); with G3 read as G4 in two frames, one
// of those was judged and marked, 7 of 13, and F#6 dropped: a coin toss
// that another voice's octave decided.
func (t *track) onPartials() bool {
	return 2*t.partial > t.count-t.unjudged && math.Abs(t.partialCents) < partialNoteCents*float64(t.partial)
}

// partials says which voices vs of the frame last pushed are a lower voice's
// partials as their notes will be judged: marked so in this frame
// (multipitch.Voice.OnPartials) and their track so far most of whose
// frames are, on the partial itself (onPartials). The group meter shows
// the others, so a voice steadily off a partial, which one frame's tests
// cannot part from it, stays on the screen as its note stays in the rows.
// A marked voice is judged by its frame alone unless its track and that of
// a voice it lies on are both long enough for notes: a partial read as a
// voice strays up to 20 ¢ from it in a frame (the open voicing's B4 on its
// E3's 3rd partial), which a few frames average out, and a release read an
// octave low (a sawtooth C4's as C3) puts a held G4 on its partial for a
// frame, where the rows' pitches are passing readings anyway.
func (tr *tracker) partials(vs []multipitch.Voice) []bool {
	held := func(i int) bool { return tr.fed[i].count >= tr.fed[i].seg.MinFrames }
	on := make([]bool, len(vs))
	for i, v := range vs {
		under := false
		for j, lo := range vs[:i] { // lowest first
			under = under || multipitch.OnPartial(v.Hz, lo.Hz) && held(j)
		}
		on[i] = v.OnPartials && (!held(i) || !under || tr.fed[i].onPartials())
	}
	return on
}

// heldSoFar says which voices of the frame last pushed continue a track
// held long enough for a note, and which of those notes, ended now, would
// be dropped as a lower voice's partials (onPartials): judged over the
// track's frames, whatever this frame's mark. A track's first frames are
// not judged, since one frame's mark alone can fall on a real voice.
func (tr *tracker) heldSoFar() (held, partials []bool) {
	held, partials = make([]bool, len(tr.fed)), make([]bool, len(tr.fed))
	for i, t := range tr.fed {
		held[i] = t.count >= t.seg.MinFrames
		partials[i] = held[i] && t.onPartials()
	}
	return held, partials
}

// partialNoteCents: a lower voice's partial taken for a voice is read on
// or near it, its frames a few cents either side as the joint fit shares
// it; a note whose marked frames lie this far off on average is a voice of
// its own that one window's tests could not part from the partial (a
// flute's E5 wavering 12 to 34 ¢ over a trombone's C3's 5th partial, 21 ¢
// on average). Measured with --voices on the twelve rendered scenes
// (voices_mix_test.go, voices_untuned_test.go) and their lone parts: the
// notes most of whose frames are so marked, all partials but that E5,
// average 0 to 11.4 ¢ from the partial (a lone cello's D4 on its G2's 3rd
// partial 11.4 ¢), save two chorused or bowed partials surfacing over
// their own held note, 17.9 and 19.3 ¢ off, which voicesurfaced.go drops.
const partialNoteCents = 15.0

// partialOffset is how far hz lies, in cents, from the nearest partial 3
// to 6 (multipitch.PartialCents) of a voice below it in vs.
func partialOffset(vs []multipitch.Voice, hz float64) float64 {
	best := math.Inf(1)
	for _, lo := range vs {
		if c, ok := multipitch.PartialCents(hz, lo.Hz); ok && lo.Hz < hz && math.Abs(c) < math.Abs(best) {
			best = c
		}
	}
	if math.IsInf(best, 1) {
		return 0
	}
	return best
}

// level is the track's mean power over its frames.
func (t *track) level() float64 { return t.power / float64(max(t.count, 1)) }

// foldOctave reports whether note h of track t lies an octave above a
// louder voice's note (multipitch.OctaveAbove) for at least half its
// length: then it is that note's octave, doubled or its own even partials
// moving with a vibrato (a bassoon's, a choir's), which the frames could
// not tell apart, and it is not a voice. Frames fold an octave doubling
// into the lower voice already; this is the same rule for the notes the
// frames let through. The note below keeps the mark its frames give it
// (doubled where its even partials stand out): folding cannot say which
// the octave was. Only below a louder note: a flute's G5 over a bassoon's
// C3 would otherwise fold into the quiet G4 read on the bassoon's 3rd
// partial.
func (tr *tracker) foldOctave(t *track, h pitchdetect.Held) bool {
	half := (h.End - h.Start) / 2
	for _, d := range tr.done {
		if multipitch.OctaveAbove(h.Hz, d.Hz) && d.power > t.level() && min(d.End, h.End)-max(d.Start, h.Start) >= half {
			return true
		}
	}
	for _, o := range tr.tracks {
		if o != t && o.holding() && !o.onPartials() && multipitch.OctaveAbove(h.Hz, o.hz) && o.level() > t.level() && h.End-max(o.start, h.Start) >= half {
			return true
		}
	}
	return false
}
