package ui

import (
	"math"

	"fifthline/target"
)

// GroupFrame is one moment of a group, as the meter's rows hear it: several
// players on their own channels (package ensemble) or several voices on one
// (package multipitch, rows low to high).
type GroupFrame struct {
	Time   float64   // stream seconds
	Hz     []float64 // each row's pitch, indexed like Options.Group; 0: silent
	Levels []float64 // each row's level, dBFS, indexed like Hz
	// Doubled: the row's voice has another an octave above it, which one
	// microphone cannot part from it (multipitch); nil for none.
	Doubled []bool
	Level   float64 // the loudest row's level, dBFS
	// Drift is how far the whole group has moved from the reference, in
	// cents, apart from each chord's own tuning; the screen shows "—"
	// while DriftKnown is false.
	Drift      float64
	DriftKnown bool
	// Span is how many seconds of sound each row's reading in this frame
	// covers, when that is more than the frames' spacing: the voices'
	// windows (171 or 341 ms, a frame every 85 ms). 0 for the players'
	// short frames.
	Span float64
}

// Rows hold a pitch once it has stayed within rowCents of itself over the
// last rowSeconds, for at least rowFrames frames, and drop it rowBridge
// seconds after its last frame: steady enough to read a chord by, quick
// enough to follow a change of chord within a beat. Frames rowFallDB below
// the loudest of them are left out: a note's release is not its pitch.
const (
	rowFallDB  = 6
	rowSeconds = 0.5 // more than two cycles of a 5 Hz vibrato: its centre
	rowCents   = 50
	rowFrames  = 3
	rowBridge  = 0.15
)

// A voice's frames on one microphone read long windows (GroupFrame.Span),
// a frame every 85 ms: rowLongFrames of them hold its pitch (one alone may
// be the estimator's passing misreading, an octave low at a sawtooth's
// abrupt end: measured), and their levels are not compared (the
// estimator's first frame after an onset reads the voices 11 dB louder
// than the next, measured, which kept a chord's steady frames out for
// rowSeconds).
const rowLongFrames = 2

// chordsKept is how many earlier chords the screen recalls.
const chordsKept = 4

// chordSettle is how long a new chord must sound on the players' short
// frames before the screen names it: players never change at quite the
// same moment, and the half-changed chords between are not the group's.
const chordSettle = 0.2

// One microphone's voices come as long windows' readings (GroupFrame.Span),
// a frame every 85 ms, each row already held on two agreeing frames: a
// chord out of silence is named at the first frame its rows hold it, none
// still attacking (a voice read but not yet held: the chord is about to
// change), and a change of chord once longFramesAgree frames in a row name
// it (the first windows after a change still hear the chord before). Held
// to chordSettle of stream time, as the players' frames are, a chord was
// named 0.28 s after it started on the stream's clock, now 0.20 s
// (TestAChordFromOneMicrophoneIsNamedWithin300ms; the voices issue asks
// 0.3 s); a change, 0.26 s after its frames first named it, now 0.085 s.
const longFramesAgree = 2

// groupModel is what the group meter knows. Like model it keeps pitches,
// not readings: chords and cents are read at render time in the current
// tuning, so a key press re-reads everything at once.
type groupModel struct {
	*model  // the tuning, the time and the status lines are the single meter's
	Names   []string
	Seventh float64 // the just ratio a minor seventh is read against
	Off     []bool  // rows switched off: shown as off, kept out of chords

	Drift      float64
	DriftKnown bool

	rows []groupRow
	// chord is the pitches (per row, 0 for no member) of the chord sounding
	// now or last; before holds the ones before it, oldest first.
	chord     []float64
	sounding  bool // chord is sounding now
	before    [][]float64
	left      []bool // rows that have played another note since chord
	chordName string // chord's name when it was heard, to tell a change
	// next is a chord heard since nextAt, in nextFrames frames in a row,
	// that differs from chord's; it replaces it once settled (settled).
	next       string
	nextAt     float64
	nextFrames int
	// nextFresh: next was first heard out of silence, no chord sounding.
	nextFresh bool
	span      float64 // the latest frame's GroupFrame.Span
	// Doubles: rows may be marked doubled (Options.Doubles).
	Doubles bool
	// silentAt is the time of the latest frame in which no row was voiced.
	silentAt float64
}

// groupRow is one player's or voice's recent frames and what they hold.
type groupRow struct {
	times, hz []float64 // voiced frames of the last rowSeconds
	levels    []float64 // their levels, dBFS
	doubled   []bool    // their doubled marks
	Hz        float64   // the pitch held now, 0 when none
	Last      float64   // the last pitch held
	// Doubled: most frames of the pitch held now (or last) were doubled.
	Doubled bool
	// Attacking: the newest frame reads a pitch the row does not hold yet.
	Attacking bool
}

func newGroupModel(m *model, names []string, seventh float64) *groupModel {
	if seventh == 0 {
		seventh = target.DefaultSeventh
	}
	return &groupModel{model: m, Names: names, Seventh: seventh, Off: make([]bool, len(names)), left: make([]bool, len(names)), rows: make([]groupRow, len(names))}
}

// AddFrame takes one moment of the group.
func (g *groupModel) AddFrame(f GroupFrame) {
	g.Now, g.Level, g.span = f.Time, f.Level, f.Span
	g.Voiced = false
	for i := range g.rows {
		hz, level, doubled := 0.0, 0.0, false
		if i < len(f.Hz) {
			hz = f.Hz[i]
		}
		if i < len(f.Levels) {
			level = f.Levels[i]
		}
		if i < len(f.Doubled) {
			doubled = f.Doubled[i]
		}
		g.Voiced = g.Voiced || hz > 0
		g.rows[i].add(f.Time, hz, level, f.Span, doubled)
	}
	if !g.Voiced {
		g.silentAt = f.Time
	}
	g.Drift, g.DriftKnown = f.Drift, f.DriftKnown
	g.followChord(false)
}

// add keeps the row's voiced frames of the last rowSeconds and decides what
// it holds: the mean (in cents) of those within rowCents of the newest and
// within rowFallDB of the loudest of these; doubled when most of them are.
func (r *groupRow) add(t, hz, level, span float64, doubled bool) {
	if hz > 0 && !math.IsInf(hz, 0) {
		r.times, r.hz, r.levels, r.doubled = append(r.times, t), append(r.hz, hz), append(r.levels, level), append(r.doubled, doubled)
	}
	cut := 0
	for cut < len(r.times) && r.times[cut] < t-rowSeconds {
		cut++
	}
	r.times, r.hz, r.levels, r.doubled = r.times[cut:], r.hz[cut:], r.levels[cut:], r.doubled[cut:]
	r.Hz = 0
	r.Attacking = hz > 0 && !math.IsInf(hz, 0)
	n := len(r.hz)
	if n == 0 || t-r.times[n-1] > rowBridge {
		return
	}
	need, fall := rowFrames, float64(rowFallDB)
	if span > 0 {
		need, fall = rowLongFrames, math.Inf(1)
	}
	newest, loudest := r.hz[n-1], math.Inf(-1)
	near := func(f float64) bool { return math.Abs(1200*math.Log2(f/newest)) <= rowCents }
	for i, f := range r.hz {
		if near(f) {
			loudest = max(loudest, r.levels[i])
		}
	}
	sum, k, marked := 0.0, 0, 0
	for i, f := range r.hz {
		if near(f) && r.levels[i] >= loudest-fall {
			sum += math.Log2(f)
			k++
			if r.doubled[i] {
				marked++
			}
		}
	}
	if k >= need {
		r.Hz = math.Exp2(sum / float64(k))
		r.Last, r.Doubled, r.Attacking = r.Hz, 2*marked > k, false
	}
}

// holding is the pitches the rows switched on hold now, per row.
func (g *groupModel) holding() []float64 {
	hz := make([]float64, len(g.rows))
	for i, r := range g.rows {
		if !g.Off[i] {
			hz[i] = r.Hz
		}
	}
	return hz
}

// followChord notes the chord the group holds now, once it has settled
// (at once when forced: a key changed the rows); a new chord pushes the
// last one into before.
func (g *groupModel) followChord(force bool) {
	hz := g.holding()
	c, _, ok := g.name(hz)
	name := ""
	if ok {
		name = c.Root.PrettyName() + " " + c.Quality
	}
	if name != g.next {
		g.next, g.nextAt, g.nextFrames = name, g.Now, 0
		g.nextFresh = !g.sounding && g.Now-g.silentAt <= rowSeconds
	}
	if !force {
		g.nextFrames++
	}
	if !ok || name != g.chordName && !force && !g.settled() {
		g.sounding = false
		for i, f := range hz {
			if f > 0 && (i >= len(g.chord) || !(math.Abs(1200*math.Log2(f/g.chord[i])) <= rowCents)) {
				g.left[i] = true
			}
		}
		return
	}
	g.sounding = true
	if name == g.chordName {
		// A player who stops while the others hold the chord on is still
		// heard in it: their last note stays a member, dim.
		for i, f := range hz {
			if f == 0 && !g.Off[i] && i < len(g.chord) && g.chord[i] > 0 {
				hz[i] = g.chord[i]
			}
		}
	} else {
		if g.chord != nil {
			g.before = append(g.before, g.chord)
			if len(g.before) > chordsKept {
				g.before = g.before[1:]
			}
		}
		g.chordName = name
	}
	g.chord = hz
	clear(g.left)
}

// settled says whether next, a chord other than the one named, has sounded
// long enough to be named: see chordSettle and longFramesAgree.
func (g *groupModel) settled() bool {
	if g.span == 0 {
		return g.Now-g.nextAt >= chordSettle
	}
	attacking := false
	for i, r := range g.rows {
		attacking = attacking || r.Attacking && !g.Off[i]
	}
	return g.nextFresh && !attacking || g.nextFrames >= longFramesAgree
}

// name names the chord the per-row pitches make in the current tuning;
// rows[i] is the row of the chord's i-th given pitch.
func (g *groupModel) name(perRow []float64) (target.HeardChord, []int, bool) {
	var hz []float64
	var rows []int
	for i, f := range perRow {
		if f > 0 {
			hz, rows = append(hz, f), append(rows, i)
		}
	}
	if len(hz) < 2 {
		return target.HeardChord{}, nil, false
	}
	c, ok := g.Tuning.NameChord(hz, g.Seventh)
	return c, rows, ok
}

// rowReading is one row as the screen shows it.
type rowReading struct {
	Name    string
	On      bool
	Holding bool        // a pitch is held now (else: the last one, or none)
	Heard   bool        // a pitch has been held at all
	Note    target.Note // spelled from the chord's root when in a chord
	Cents   float64     // against the temperament
	InChord bool
	Role    string  // root, third, fifth, seventh
	Just    float64 // cents against just above the sounding root
	Doubled bool    // another voice an octave above it (groupRow.Doubled)
	// Unheard: a voice on one microphone that holds no pitch while other
	// voices do (unheardNow): the row says so rather than a note.
	Unheard bool
}

// readings reads every row in the current tuning: members of the chord
// sounding now are spelled from its root and read against just.
func (g *groupModel) readings() []rowReading {
	out := make([]rowReading, len(g.rows))
	members := map[int]target.HeardMember{}
	if c, rows, ok := g.name(g.chord); ok {
		for _, m := range c.Members {
			members[rows[m.Index]] = m
		}
	}
	unheard := g.unheardNow()
	for i, r := range g.rows {
		rr := rowReading{Name: g.Names[i], On: !g.Off[i], Holding: r.Hz > 0, Heard: r.Last > 0, Doubled: r.Doubled}
		if rr.Unheard = unheard && rr.On && rr.Heard && !rr.Holding; rr.Unheard {
			rr.Doubled = false
			out[i] = rr
			continue
		}
		// After the chord: a row still reads in it until it plays on.
		m, member := members[i]
		member = member && rr.On && (g.sounding || !rr.Holding && !g.left[i])
		if member {
			rr.Note, rr.Cents, rr.InChord, rr.Role, rr.Just = m.Note, m.Cents, true, m.Role, m.JustCents
		} else if rr.Heard {
			rd := g.Tuning.Classify(r.Last)
			rr.Note, rr.Cents = rd.Note, rd.Deviation
		}
		out[i] = rr
	}
	return out
}

// unheardNow says whether a row holding nothing is a voice not heard now:
// on one microphone (long windows, GroupFrame.Span) a row is a place in
// the chord, lowest first, not a player, so while other rows hold the
// sounding chord its last pitch may be another chord's note (a previous
// chord's E4 was shown under an F major whose F4 was hidden in its bass's
// partials). A player's row keeps its last note: the player is still that
// row; so do the voices' rows once the whole group stops (the last chord).
func (g *groupModel) unheardNow() bool {
	if g.span == 0 {
		return false
	}
	for i, r := range g.rows {
		if r.Hz > 0 && !g.Off[i] {
			return true
		}
	}
	return false
}

// Toggle switches row i (from 0) off or on and says so.
func (g *groupModel) Toggle(i int) {
	if i < 0 || i >= len(g.Off) {
		return
	}
	g.Off[i] = !g.Off[i]
	if g.Off[i] {
		g.Say(g.Names[i] + " off: left out of the chords")
	} else {
		g.Say(g.Names[i] + " on again")
	}
	g.followChord(true)
}
