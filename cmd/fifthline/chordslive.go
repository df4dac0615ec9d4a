package main

import (
	"maps"
	"math"
	"slices"
	"strconv"
	"time"

	"fifthline/ensemble"
	"fifthline/harmony"
	"fifthline/journal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// The chords of a group as it is heard (listen --players or --voices, with
// the meter or --plain), found with or without --chords, since every note
// row is spelled from its chords (heldrows.go): with --chords each chord is
// written as soon as no note still to come can change it, named in the tuning in force when it ended (the
// meter's keys change it mid-session), and only the notes and frames of
// chords not yet written are kept: a long session's memory stays flat, and
// an interruption finds every chord already ended written.

// readyEvery is how much stream time passes between looks for chords
// that are ready: a row comes at most this late, and a look costs little.
const readyEvery = 0.1

// tuningLog remembers when the tuning changed, in the stream's time.
type tuningLog struct {
	src  *session.Tunings
	seen *target.Tuning
	at   []float64 // at[0] is -Inf: the tuning the session began in
	tus  []target.Tuning
}

func newTuningLog(src *session.Tunings) *tuningLog {
	l := &tuningLog{src: src}
	tu, _ := src.Current(&l.seen)
	l.at, l.tus = []float64{math.Inf(-1)}, []target.Tuning{tu}
	return l
}

// moment notes a key that changed the tuning before the moment at t.
func (l *tuningLog) moment(t float64) {
	if tu, same := l.src.Current(&l.seen); !same {
		l.at, l.tus = append(l.at, t), append(l.tus, tu)
	}
}

// in is the tuning in force at t.
func (l *tuningLog) in(t float64) target.Tuning {
	i, found := slices.BinarySearch(l.at, t)
	if !found {
		i--
	}
	return l.tus[i]
}

// forget drops the changes no chord from before on needs.
func (l *tuningLog) forget(before float64) {
	i, found := slices.BinarySearch(l.at, before)
	if !found {
		i--
	}
	if i > 0 {
		l.at, l.tus = slices.Delete(l.at, 0, i), slices.Delete(l.tus, 0, i)
	}
}

// quietFrames is how many unvoiced frames in a row end a note whatever
// its level (pitchdetect.Segmenter's MaxDropout, which ensemble keeps).
var quietFrames = pitchdetect.NewSegmenter(1).MaxDropout

// nextStart follows one player's frames and notes, to know the earliest
// their note still to come can start: after their last note's end (one
// player's notes follow each other), after a silence long enough to end
// any note, and not before a frame not yet seen.
type nextStart struct {
	lastEnd, quietAt, seen float64
	quiet                  int // unvoiced frames in a row
}

func (n *nextStart) frame(t, hz float64) {
	n.seen = t
	if hz > 0 {
		n.quiet = 0
		return
	}
	if n.quiet++; n.quiet > quietFrames {
		n.quietAt = t
	}
}

func (n *nextStart) earliest() float64 { return min(max(n.lastEnd, n.quietAt), n.seen) }

// playerChords finds the players' chords as they are heard.
type playerChords struct {
	players []ensemble.Player
	stream  harmony.Stream
	tracks  []harmony.Track // each player's frames, indexed like players
	next    []nextStart
	open    []openNote // each player's note still sounding
	tunings *tuningLog
	asked   float64 // the horizon of the last look
	emit    func(ensemble.Chord, target.Tuning) error
	rows    heldRows[playerNote]
	err     error // the first from emit or a row
}

// liveChords finds the chords while the players are heard: it hands each
// to emit (nil: without --chords) in the tuning it was named in, and each
// note to row once spelled as the chords it sounds in spell it
// (heldrows.go).
func (po *playerOptions) liveChords(tunings *session.Tunings, emit func(ensemble.Chord, target.Tuning) error, row func(playerNote) error) *playerChords {
	h := &playerChords{players: po.players, tracks: make([]harmony.Track, len(po.players)), next: make([]nextStart, len(po.players)),
		open: make([]openNote, len(po.players)), tunings: newTuningLog(tunings), asked: math.Inf(-1), emit: emit}
	h.rows = heldRows[playerNote]{event: func(n *playerNote) *session.Event { return &n.Event },
		who: func(n *playerNote) string { return n.Player.Name }, write: row, heard: func(n *playerNote) *time.Time { return &n.heard }}
	h.stream.Seventh = po.seventh
	return h
}

// frame takes player i's frame (ensemble.Options.OnFrame: every player's
// frame of a moment in player order).
func (h *playerChords) frame(i int, est pitchdetect.Estimate) {
	if i == 0 {
		h.tunings.moment(est.Time)
	}
	h.tracks[i].Add(est.Time, est.Hz)
	h.rows.now = max(h.rows.now, est.Time)
	h.next[i].frame(est.Time, est.Hz)
	if i == len(h.players)-1 {
		h.ready(false)
	}
}

// openNote is a player's note still sounding, sure to begin at start
// (ensemble.Options.OnSounding), through the time of its last frame.
type openNote struct {
	start, through float64
	ok             bool
	settled        float64 // where its reading begins, once settles
	settles        bool
}

// sound takes player i's note still sounding (ensemble.Options.OnSounding).
func (h *playerChords) sound(i int, start, through float64, ok bool, settled float64, settles bool) {
	h.open[i] = openNote{start, through, ok, settled, settles}
}

// note takes a player's note as it ends, and gives back the first error
// emit or a row met, to stop the reading.
func (h *playerChords) note(pn playerNote) error {
	n := pn.Note
	p := slices.Index(h.players, n.Player)
	if p < 0 {
		return h.err
	}
	h.rows.add(pn)
	h.open[p].ok = false // given: no longer sounding
	h.next[p].lastEnd = max(h.next[p].lastEnd, n.Held.End)
	h.stream.Add(harmony.Note{Start: n.Held.Start, End: n.Held.End, Who: n.Player.Name, Note: n.Reading.Note,
		Frames: &h.tracks[p], Hz: n.Held.Hz, Settled: n.Held.Settled})
	return h.err
}

// ready emits the chords nothing to come can change; at the end of the
// stream, all that are left.
func (h *playerChords) ready(end bool) error {
	horizon := math.Inf(1)
	var sounding []harmony.Note
	defer func() { h.rows.tell(len(sounding)) }()
	if !end {
		// A player whose note sounds starts no other before its last
		// frame: the chords above it come without waiting for its end.
		for i, n := range h.next {
			if o := h.open[i]; o.ok {
				horizon = min(horizon, o.through, n.seen)
				sounding = append(sounding, harmony.Note{Start: o.start, Who: h.players[i].Name, Frames: &h.tracks[i],
					Settled: o.settled, Settles: o.settles})
				continue
			}
			horizon = min(horizon, n.earliest())
		}
		if horizon < h.asked+readyEvery {
			return h.err
		}
	}
	h.asked = horizon
	h.stream.Sound(sounding)
	chords, notes := h.stream.Ready(horizon, h.tunings.in)
	for _, c := range chords {
		h.rows.chord(c.Start, c.End, heldMembers(c, notes))
	}
	// The notes' rows before their chords' memberships, as the journal
	// wants them (journal.Extra).
	if err := h.rows.release(h.stream.Settled()); err != nil && h.err == nil {
		h.err = err
	}
	for _, c := range chords {
		if h.emit == nil {
			break
		}
		ps := make([]ensemble.Player, len(c.Notes))
		for i, k := range c.Notes {
			ps[i] = h.players[slices.IndexFunc(h.players, func(p ensemble.Player) bool { return p.Name == notes[k].Who })]
		}
		if err := h.emit(ensemble.Chord{Start: c.Start, End: c.End, HeardChord: c.HeardChord, Players: ps}, h.tunings.in(c.End)); err != nil && h.err == nil {
			h.err = err
		}
	}
	from := h.stream.From()
	for p := range h.tracks {
		h.tracks[p].Forget(from)
	}
	h.tunings.forget(from)
	return h.err
}

// heldMembers are a chord's members for heldRows.chord.
func heldMembers(c harmony.Chord, notes []harmony.Note) []heldMember {
	ms := make([]heldMember, len(c.Notes))
	for i, k := range c.Notes {
		ms[i] = heldMember{notes[k].Who, notes[k].Start, c.Members[i].Note}
	}
	return ms
}

// voiceChords finds the chords of the voices heard on one channel as they
// are heard.
type voiceChords struct {
	stream  harmony.Stream
	tunings *tuningLog
	asked   float64
	emit    func(c harmony.Chord, voices []int, doubled []bool, tu target.Tuning) error
	rows    heldRows[voiceNote]
	err     error
	// doubled holds the doubled notes added (by voice and start) until the
	// stream has forgotten them.
	doubled map[voiceStart]bool
	left    *leftOut // the voices left out beyond --voices N, for the names
}

// voiceStart names a voice's note: its voice's number and its start.
type voiceStart struct {
	who   string
	start float64
}

// liveChords finds the chords while the voices are heard: it hands each
// (with its members' voices, and which of them are doubled) to emit (nil:
// without --chords), and each note to row once spelled as the chords it
// sounds in spell it (heldrows.go). A voice lost for a moment under a
// chord is bridged as the file analysis bridges it (bridgeLost).
func (vo *voiceOptions) liveChords(tunings *session.Tunings, emit func(harmony.Chord, []int, []bool, target.Tuning) error, row func(voiceNote) error) *voiceChords {
	if vo.left == nil { // kept from the frames hearVoices caps
		vo.left = &leftOut{asked: vo.max, record: true}
	}
	v := &voiceChords{tunings: newTuningLog(tunings), asked: math.Inf(-1), emit: emit, doubled: map[voiceStart]bool{}, left: vo.left}
	v.rows = heldRows[voiceNote]{event: func(n *voiceNote) *session.Event { return &n.Event },
		who: func(n *voiceNote) string { return strconv.Itoa(n.voice) }, write: row, pieces: true,
		heard: func(n *voiceNote) *time.Time { return &n.heard }}
	v.stream = harmony.Stream{Seventh: vo.seventh, Reach: lostSeconds, OneChannel: true, Join: func(ns []harmony.Note) []harmony.Note {
		joined, _ := bridgeLost(ns)
		return joined
	}}
	vo.onMoment = func(at, earliest float64, open []openVoice) { v.ready(at, earliest, open) }
	return v
}

func (v *voiceChords) note(n voiceNote) error {
	v.rows.add(n)
	v.stream.Add(n.harmonyNote())
	v.doubled[voiceStart{strconv.Itoa(n.voice), n.Start}] = n.doubled
	return v.err
}

// ready emits the chords of the notes that no note to come (starting at
// or after earliest; +Inf at the end) can change, the voices' notes still
// sounding (open) read over each chord's stretch as they will be.
func (v *voiceChords) ready(at, earliest float64, open []openVoice) error {
	v.tunings.moment(at)
	v.rows.now = at
	defer v.rows.tell(len(open))
	if !math.IsInf(earliest, 1) && earliest < v.asked+readyEvery {
		return v.err
	}
	v.asked = earliest
	sounding := make([]harmony.Note, len(open))
	for i, o := range open {
		o.readPitch()
		who := strconv.Itoa(o.voice)
		sounding[i] = harmony.Note{Start: o.start, Who: who, Frames: o.frames, Hz: o.hz, Settled: o.settled, Settles: o.settles}
		v.doubled[voiceStart{who, o.start}] = o.doubled // so far; its note says at its end
	}
	v.stream.Sound(sounding)
	chords, notes := v.stream.Ready(earliest, v.tunings.in)
	chords = slices.DeleteFunc(chords, func(c harmony.Chord) bool {
		return !v.left.names(c, v.tunings.in(c.End), v.stream.Seventh) // named from what is left of it (voicebeyond.go)
	})
	for _, c := range chords {
		v.rows.chord(c.Start, c.End, heldMembers(c, notes))
	}
	// The notes' rows before their chords' memberships (journal.Extra).
	if err := v.rows.release(v.stream.Settled()); err != nil && v.err == nil {
		v.err = err
	}
	for _, c := range chords {
		if v.emit == nil {
			break
		}
		tu := v.tunings.in(c.End)
		voices, doubled := make([]int, len(c.Notes)), make([]bool, len(c.Notes))
		for i, k := range c.Notes {
			voices[i], _ = strconv.Atoi(notes[k].Who)
			doubled[i] = v.doubled[voiceStart{notes[k].Who, notes[k].Start}]
		}
		if err := v.emit(c, voices, doubled, tu); err != nil && v.err == nil {
			v.err = err
		}
	}
	from := v.stream.From()
	v.tunings.forget(from)
	v.left.forget(from)
	maps.DeleteFunc(v.doubled, func(n voiceStart, _ bool) bool { return n.start < from })
	for _, o := range open {
		if o.frames != nil {
			o.frames.Forget(from) // the notes given forget theirs (Stream.Ready)
		}
	}
	return v.err
}

// journalVoiceChord writes a voices' chord's memberships to the journal.
func journalVoiceChord(j *journalSink, source string, tu target.Tuning, c harmony.Chord, voices []int) {
	j.chord(source, tu, c.Start, c.End, c.HeardChord, func(i int) (string, journal.Extra) { return "", journal.Extra{Voice: strconv.Itoa(voices[i])} }, time.Time{})
}

// voiceChordRows are a voices' chord's rows, one per member, lowest first.
func voiceChordRows(c harmony.Chord, voices []int, doubled []bool) []chordJSON {
	var out []chordJSON
	for i, m := range c.Members {
		row := newChordJSON("", c.Start, c.End, c.HeardChord, m)
		row.Voice, row.Doubled = voices[i], &doubled[i]
		out = append(out, row)
	}
	return out
}
