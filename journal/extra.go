package journal

import (
	"math"
	"slices"
	"strconv"
	"time"

	"fifthline/session"
	"fifthline/target"
)

// Extra is what a row carries in the Trailing columns. A note row has at
// most a Voice. A chord membership row says that the note sounded Member
// (root, third, fifth, seventh) of HeardChord ("E major") from the chord's
// start to its end, JustCents from just above the lowest sounding root (the
// chord rows' just_cents); its note columns are the member's, read within
// the chord. Membership rows are written when the chord ends, after the
// notes' own rows, and report keeps them apart from those.
type Extra struct {
	Voice      string // the voice's number with --voices; empty otherwise
	HeardChord string
	Member     string
	JustCents  float64
	// JustRatio is the just ratio above the root the member was judged
	// against ("5/4", and for a seventh the --seventh in force: "16/9"),
	// so report can say which sevenths were judged.
	JustRatio string
	// Reference marks the lowest sounding root, the pitch the others'
	// JustCents are measured from: its just_cents is left empty, since it
	// is no reading against just.
	Reference bool
	// Channel is a player's channel with --players, counted from 1 (0:
	// none), so report can keep the players in the order they sit.
	Channel int
}

// Membership is the row of member m of chord c, held from start to end
// seconds, as an event and its Extra: the note as the chord spells it, its
// cents against the temperament's target of that note.
func Membership(source, player string, tu target.Tuning, start, end float64, c target.HeardChord, m target.HeardMember) (session.Event, Extra) {
	ev := session.Event{Source: source, Player: player, Tuning: tu}
	ev.Start, ev.End, ev.Hz = start, end, m.Hz
	ev.Reading = target.Reading{Hz: m.Hz, Note: m.Note, Written: tu.Transpose.Written(m.Note), Deviation: m.Cents,
		TargetHz: m.Hz / math.Exp2(m.Cents/1200)}
	lowest := slices.IndexFunc(c.Members, func(o target.HeardMember) bool { return o.Role == "root" })
	ref := lowest >= 0 && c.Members[lowest].Index == m.Index
	return ev, Extra{HeardChord: c.Name(), Member: m.Role, JustCents: m.JustCents, JustRatio: m.Just, Reference: ref}
}

// WriteExtra appends a row with its Extra: a note of a recording that began
// at start, or heard now when start is zero (as Write). A membership row
// heard now is placed in the current run without moving it (it comes
// after the notes that ended later).
func (w *Writer) WriteExtra(ev session.Event, x Extra, start time.Time) error {
	switch {
	case !start.IsZero():
		return w.write(ev, x, func() time.Time { return start.Add(seconds(ev.Start)) })
	case x.HeardChord != "":
		return w.write(ev, x, func() time.Time { return w.opened.Add(seconds(w.run.base + ev.Start)) })
	}
	return w.write(ev, x, w.now(ev))
}

// record is the Trailing columns' values.
func (x Extra) record() []string {
	just := ""
	if x.HeardChord != "" && !x.Reference {
		just = target.Decimal(x.JustCents, 2)
	}
	channel := ""
	if x.Channel > 0 {
		channel = strconv.Itoa(x.Channel)
	}
	ratio := ""
	if x.HeardChord != "" {
		ratio = x.JustRatio
	}
	return []string{x.Voice, x.HeardChord, x.Member, just, channel, ratio}
}
