package target

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// Chord naming: what chord do pitches sounding together make? The root is
// spelled from the key's window and every member from the root (G♯ as the
// third of E major in F major), so a member is read against the target of
// the note it is in this chord, and against just above the root actually
// sounding.

// Member roles in a heard chord.
const (
	RoleRoot    = "root"
	RoleThird   = "third"
	RoleFifth   = "fifth"
	RoleSeventh = "seventh"
)

// Seventh ratios --seventh accepts (interface contract): 16/9 two pure
// fourths stacked, the default; 9/5 a pure minor third above the fifth; 7/4
// the harmonic seventh (common practice).
var sevenths = map[string]float64{"16/9": 16.0 / 9, "9/5": 9.0 / 5, "7/4": 7.0 / 4}

// DefaultSeventh is the minor seventh's just ratio unless --seventh says otherwise.
const DefaultSeventh = 16.0 / 9

// just is the tone's ratio and fraction above the root, with seventh (0:
// DefaultSeventh) for the minor seventh, whose ratio is chosen.
func (t chordTone) just(seventh float64) (float64, string) {
	if t.ratio != 0 {
		return t.ratio, t.fraction
	}
	if seventh == 0 {
		seventh = DefaultSeventh
	}
	for f, r := range sevenths {
		if r == seventh {
			return r, f
		}
	}
	return seventh, strconv.FormatFloat(seventh, 'g', 6, 64)
}

// ParseSeventh reads a --seventh value: 7/4, 9/5 or 16/9.
func ParseSeventh(s string) (float64, error) {
	if r, ok := sevenths[strings.TrimSpace(s)]; ok {
		return r, nil
	}
	return 0, fmt.Errorf("--seventh %q: use 7/4, 9/5 or 16/9", s)
}

// shapeTone is a chord member: its role and its spelled interval and just
// ratio above the root (chordTone, shared with declared chords; the minor
// seventh's ratio is the one the caller chooses).
type shapeTone struct {
	role string
	tone chordTone
}

// chordShape is a chord quality as heard: its members above the root.
type chordShape struct {
	quality string
	tones   []shapeTone
}

var (
	hRoot = shapeTone{RoleRoot, chordTone{0, 1, "1/1"}}
	hMaj3 = shapeTone{RoleThird, majThird}
	hMin3 = shapeTone{RoleThird, minThird}
	hP5   = shapeTone{RoleFifth, fifth}
	hDim5 = shapeTone{RoleFifth, dimFifth}
	hAug5 = shapeTone{RoleFifth, augFifth}
	hMin7 = shapeTone{RoleSeventh, minSev}
	hMaj7 = shapeTone{RoleSeventh, majSev}
	hDim7 = shapeTone{RoleSeventh, chordTone{-9, 216.0 / 125, "216/125"}} // three pure minor thirds, as dimFifth is two (common practice)
)

// shapes are tried in this order; the complete chords come first, so a
// pitch-class set matches its fullest reading. Two-note shapes name what a
// duet implies: a third or sixth its triad, a bare fifth "open fifth".
var shapes = []chordShape{
	{"dominant seventh", []shapeTone{hRoot, hMaj3, hP5, hMin7}},
	{"minor seventh", []shapeTone{hRoot, hMin3, hP5, hMin7}},
	{"major seventh", []shapeTone{hRoot, hMaj3, hP5, hMaj7}},
	{"half-diminished seventh", []shapeTone{hRoot, hMin3, hDim5, hMin7}},
	{"diminished seventh", []shapeTone{hRoot, hMin3, hDim5, hDim7}},
	{"major", []shapeTone{hRoot, hMaj3, hP5}},
	{"minor", []shapeTone{hRoot, hMin3, hP5}},
	{"diminished", []shapeTone{hRoot, hMin3, hDim5}},
	{"augmented", []shapeTone{hRoot, hMaj3, hAug5}},
	{"dominant seventh", []shapeTone{hRoot, hMaj3, hMin7}}, // fifth left out, as four-part writing often does
	{"major", []shapeTone{hRoot, hMaj3}},
	{"minor", []shapeTone{hRoot, hMin3}},
	{"open fifth", []shapeTone{hRoot, hP5}},
}

// HeardChord is a chord named from pitches sounding together.
type HeardChord struct {
	Root    Note // spelled from the key's window, in the octave of the lowest sounding root
	Quality string
	Members []HeardMember // one per pitch given, lowest first
}

// Name is the chord as the contract writes it: "E major", "G dominant seventh".
func (c HeardChord) Name() string { return c.Root.Name() + " " + c.Quality }

// HeardMember is one sounding pitch read as a member of its chord.
type HeardMember struct {
	Index int // position of the pitch in the slice given to NameChord
	Role  string
	Note  Note // spelled from the root
	Hz    float64
	// Cents is against the temperament's target of Note (no chord applied).
	Cents float64
	// JustCents is 1200·log2(Hz / (r·Ratio·2^k)), r the lowest sounding
	// root's measured pitch, k the member's octave above it.
	JustCents float64
	Ratio     float64
	// Just is Ratio as a fraction ("5/4", "16/9"), so a reader later can
	// say which just a member was judged against (--seventh chooses).
	Just string
}

// NameChord names the chord the pitches (hertz, in any order) make, with
// seventh the just ratio of a minor seventh (DefaultSeventh, or what
// ParseSeventh read). It reports false when fewer than two pitch classes
// sound or they make none of the chords it knows.
func (t Tuning) NameChord(hz []float64, seventh float64) (HeardChord, bool) {
	t.Chord = nil
	pcs := make([]int, len(hz))
	var set []int
	for i, f := range hz {
		if !(f > 0) || math.IsInf(f, 0) {
			return HeardChord{}, false
		}
		pcs[i] = t.Classify(f).Note.PitchClass()
		if !slices.Contains(set, pcs[i]) {
			set = append(set, pcs[i])
		}
	}
	if len(set) < 2 {
		return HeardChord{}, false
	}
	window := t.Key.window(make([]Note, 0, 12))
	lo, hi := t.Key.WindowSpan()
	for _, sh := range shapes {
		if len(sh.tones) != len(set) {
			continue
		}
		var best Note
		bestScore, found := 0, false
		for _, r := range window {
			inside, ok := sh.fits(r, set, lo, hi)
			// Symmetric chords (augmented, diminished seventh) fit several
			// roots: the one whose spelling stays in the key wins, then
			// the one sounding lowest.
			score := 100*inside - lowestIndex(hz, pcs, r.PitchClass())
			if ok && (!found || score > bestScore) {
				best, bestScore, found = r, score, true
			}
		}
		if found {
			return t.readMembers(sh, best, hz, pcs, seventh), true
		}
	}
	return HeardChord{}, false
}

// fits reports whether the shape built on root r covers exactly the pitch
// classes in set, and how many of its spellings lie in the window lo..hi.
func (sh chordShape) fits(r Note, set []int, lo, hi int) (inside int, ok bool) {
	for _, st := range sh.tones {
		n := noteAt(r.Fifths()+st.tone.fifths, 4)
		if !slices.Contains(set, n.PitchClass()) {
			return 0, false
		}
		if f := n.Fifths(); f >= lo && f <= hi {
			inside++
		}
	}
	return inside, true
}

// lowestIndex ranks pitch class pc by its lowest sounding pitch (0 for the
// lowest of all), so that of two possible roots the lower one wins.
func lowestIndex(hz []float64, pcs []int, pc int) int {
	low := math.Inf(1)
	for i, f := range hz {
		if pcs[i] == pc {
			low = math.Min(low, f)
		}
	}
	rank := 0
	for _, f := range hz {
		if f < low {
			rank++
		}
	}
	return rank
}

// readMembers spells every pitch from the root and reads it against the
// temperament and against just above the lowest sounding root.
func (t Tuning) readMembers(sh chordShape, r Note, hz []float64, pcs []int, seventh float64) HeardChord {
	c := HeardChord{Root: r, Quality: sh.quality}
	rootHz := math.Inf(1)
	for i, f := range hz {
		if pcs[i] == r.PitchClass() {
			rootHz = math.Min(rootHz, f)
		}
	}
	for i, f := range hz {
		st := sh.tones[slices.IndexFunc(sh.tones, func(st shapeTone) bool {
			return noteAt(r.Fifths()+st.tone.fifths, 4).PitchClass() == pcs[i]
		})]
		n := t.nearestOctave(noteAt(r.Fifths()+st.tone.fifths, 4), f)
		ratio, frac := st.tone.just(seventh)
		just := Cents(f / (rootHz * ratio))
		just -= 1200 * math.Round(just/1200)
		c.Members = append(c.Members, HeardMember{Index: i, Role: st.role, Note: n, Hz: f,
			Cents: Cents(f / t.Target(n)), JustCents: just, Ratio: ratio, Just: frac})
		if f == rootHz {
			c.Root.Octave = n.Octave
		}
	}
	slices.SortStableFunc(c.Members, func(a, b HeardMember) int { return cmp.Compare(a.Hz, b.Hz) })
	return c
}

// nearestOctave puts the spelled note n in the octave whose target lies
// nearest the measured frequency (t has no chord: NameChord cleared it).
func (t Tuning) nearestOctave(n Note, hz float64) Note {
	n.Octave += int(math.Round(Cents(hz/t.Target(n)) / 1200))
	return n
}
