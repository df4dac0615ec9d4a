package report

import (
	"cmp"
	"slices"

	"fifthline/journal"
	"fifthline/target"
)

// Options tune the summary.
type Options struct {
	// Tolerance in cents: a note within ±Tolerance of its target counts as
	// in tune, and so does a mean or a drift within it.
	Tolerance float64
	// ByRehearsal describes each note once per rehearsal (recording date)
	// instead of once over all the journals.
	ByRehearsal bool
}

// Group is one player in one tuning: key, temperament, reference pitch,
// transposition (a B♭ part's written notes are not a concert part's) and
// declared chord (readings against a chord's just targets are not pooled
// with plain ones).
type Group struct {
	Player      string   `json:"player"`
	Voice       string   `json:"voice,omitempty"` // with --voices: the voice's number
	Key         string   `json:"key"`
	Temperament string   `json:"temperament"`         // the spec, e.g. meantone:1/4
	Anchor      string   `json:"anchor"`              // the note the reference placed: a4 or tonic
	Transpose   string   `json:"transpose,omitempty"` // the instrument's --transpose; notes are then written pitch
	Chord       string   `json:"chord,omitempty"`     // the declared --chord, if any
	Name        string   `json:"temperament_name"`
	A4          float64  `json:"a4"`
	Dates       []string `json:"rehearsal_dates"` // the days its notes were played, YYYY-MM-DD, in order
	Notes       []Stats  `json:"notes"`           // per spelled note with octave, along the line of fifths
	Classes     []Stats  `json:"pitch_classes"`   // per spelled note in all octaves together
	All         Stats    `json:"all"`
	// Rehearsals is all the group's notes per rehearsal, with ByRehearsal.
	Rehearsals []Stats `json:"rehearsals,omitempty"`
	// Roles are the group's chord memberships (journal rows with a
	// heard_chord), per chord quality and member; never among the Notes.
	Roles []Role `json:"chord_roles,omitempty"`
}

// tuningOf is what keeps groups apart.
type tuningOf struct {
	player, voice, key, temperament, anchor string
	a4                                      float64
	transpose, chord                        string
}

func groupKey(e journal.Entry) tuningOf {
	return tuningOf{e.Player, e.Voice, e.Key, e.Temperament, e.Anchor, e.A4, e.Transpose, e.Chord}
}

// tuning is the group's tuning, its player and voice left out.
func (g Group) tuning() tuningOf {
	return tuningOf{"", "", g.Key, g.Temperament, g.Anchor, g.A4, g.Transpose, g.Chord}
}

// Summarize groups the entries by player (or voice) and tuning (in order of
// first appearance, players in the order they sit: seating.go) and describes each group per note, per pitch class and
// as a whole — with ByRehearsal, each of those once per rehearsal — and its
// chord memberships per chord role.
func Summarize(entries []journal.Entry, opt Options) []Group {
	var order []tuningOf
	members := map[tuningOf][]journal.Entry{}
	chords := map[tuningOf][]journal.Entry{}
	for _, e := range entries {
		k := groupKey(e)
		if _, ok := members[k]; !ok {
			order = append(order, k)
			members[k] = nil
		}
		if e.HeardChord != "" {
			chords[k] = append(chords[k], e)
		} else {
			members[k] = append(members[k], e)
		}
	}
	groups := make([]Group, 0, len(order))
	for _, k := range order {
		es := members[k]
		g := Group{Player: k.player, Voice: k.voice, Roles: roles(chords[k]), Key: k.key, Temperament: k.temperament, Anchor: k.anchor, A4: k.a4, Transpose: k.transpose, Chord: k.chord,
			Name: temperamentName(k.temperament)}
		for _, e := range es {
			g.Dates = append(g.Dates, Rehearsal(e))
		}
		slices.Sort(g.Dates)
		g.Dates = slices.Compact(g.Dates)
		g.Notes = byLabel(es, opt, target.Note.String, target.Note.String)
		g.Classes = byLabel(es, opt, target.Note.Name, target.Note.Name)
		g.All = describe("all", 0, "", es, opt, target.Note.Name)
		if opt.ByRehearsal {
			g.Rehearsals = byLabel(es, opt, func(target.Note) string { return "all" }, target.Note.Name)
			for i := range g.Rehearsals {
				g.Rehearsals[i].Fifths = 0 // not one note's place
			}
		}
		groups = append(groups, g)
	}
	seatGroups(groups, channels(entries))
	return groups
}

// Holds reports whether the entry is one of the group's notes (a chord
// membership is not a note: see Roles).
func (g Group) Holds(e journal.Entry) bool {
	k := g.tuning()
	k.player, k.voice = g.Player, g.Voice
	return e.HeardChord == "" && groupKey(e) == k
}

// Rehearsal is the day a note was played, YYYY-MM-DD, in the time zone it
// was recorded in.
func Rehearsal(e journal.Entry) string { return e.Time.Format("2006-01-02") }

// byLabel describes the entries per label of their note (and per rehearsal
// with ByRehearsal), ordered along the line of fifths, then by octave, then
// by date; altLabel names the other spelling at the same level.
func byLabel(es []journal.Entry, opt Options, label, altLabel func(target.Note) string) []Stats {
	type set struct{ label, rehearsal string }
	sets := map[set][]journal.Entry{}
	first := map[set]target.Note{}
	for _, e := range es {
		k := set{label: label(e.Note)}
		if opt.ByRehearsal {
			k.rehearsal = Rehearsal(e)
		}
		if _, ok := sets[k]; !ok {
			first[k] = e.Note
		}
		sets[k] = append(sets[k], e)
	}
	keys := make([]set, 0, len(sets))
	for k := range sets {
		keys = append(keys, k)
	}
	slices.SortFunc(keys, func(a, b set) int {
		if a.label == b.label {
			return cmp.Compare(a.rehearsal, b.rehearsal)
		}
		na, nb := first[a], first[b]
		return cmp.Or(cmp.Compare(na.Fifths(), nb.Fifths()), cmp.Compare(na.Octave, nb.Octave), cmp.Compare(a.label, b.label))
	})
	out := make([]Stats, 0, len(keys))
	for _, k := range keys {
		out = append(out, describe(k.label, first[k].Fifths(), k.rehearsal, sets[k], opt, altLabel))
	}
	return out
}

// temperamentName is the readable name of a spec, or the spec itself (a
// custom file's path, or a spec from a newer version).
func temperamentName(spec string) string {
	if t, err := target.ParseTemperament(spec); err == nil {
		return t.Name()
	}
	return spec
}
