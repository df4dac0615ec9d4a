package report

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"text/tabwriter"

	"fifthline/journal"
	"fifthline/target"
)

// RoleChords is how many chords a role needs before it is described in
// words: with one or two, one slip of the bow would be the tendency. The
// numbers are given from one chord on.
const RoleChords = 3

// Role describes how a player (or voice) tuned one member of one chord
// quality: their readings' cents from just above the chord's lowest
// sounding root (the journal's just_cents), over Count chords. The lowest
// root itself is that reference, 0 by definition, and is not counted.
type Role struct {
	Quality string `json:"chord_quality"` // "major", "dominant seventh"
	Member  string `json:"member"`        // root (an octave of the lowest), third, fifth, seventh
	// Ratio is the just ratio the member was judged against ("5/4",
	// "16/9": a seventh's is the --seventh in force); empty from journals
	// older than the just_ratio column. Sevenths judged against different
	// ratios are different roles, never averaged together.
	Ratio   string  `json:"just_ratio,omitempty"`
	Count   int     `json:"count"`
	Mean    float64 `json:"mean_just_cents"`
	Median  float64 `json:"median_just_cents"`
	Scatter float64 `json:"scatter_just_cents"` // between chords, as a note's scatter
	Words   string  `json:"words"`              // empty below RoleChords
}

// memberOrder is the order of a chord's members in the tables.
var memberOrder = []string{"root", "third", "fifth", "seventh"}

// roles describes the chord memberships per chord quality (in order of
// first appearance), member and just ratio.
func roles(members []journal.Entry) []Role {
	type key struct{ quality, member, ratio string }
	var order []key
	just := map[key][]float64{}
	for _, e := range members {
		if e.Reference {
			continue // the lowest root: no reading against just
		}
		k := key{Quality(e.HeardChord), e.Member, e.JustRatio}
		if _, ok := just[k]; !ok {
			order = append(order, k)
		}
		just[k] = append(just[k], e.JustCents)
	}
	qualities := []string{}
	for _, k := range order {
		if !slices.Contains(qualities, k.quality) {
			qualities = append(qualities, k.quality)
		}
	}
	slices.SortStableFunc(order, func(a, b key) int {
		if a.quality != b.quality {
			return slices.Index(qualities, a.quality) - slices.Index(qualities, b.quality)
		}
		if a.member != b.member {
			return memberRank(a.member) - memberRank(b.member)
		}
		return strings.Compare(a.ratio, b.ratio)
	})
	out := make([]Role, 0, len(order))
	for _, k := range order {
		r := Role{Quality: k.quality, Member: k.member, Ratio: k.ratio, Count: len(just[k]), Median: Median(just[k])}
		r.Mean, r.Scatter = MeanDeviation(just[k])
		if r.Count >= RoleChords {
			r.Words = r.Sits()
		}
		out = append(out, r)
	}
	return out
}

func memberRank(m string) int {
	if i := slices.Index(memberOrder, m); i >= 0 {
		return i
	}
	return len(memberOrder)
}

// Quality is a heard chord's quality: "E major" → "major", "F# dominant
// seventh" → "dominant seventh".
func Quality(chord string) string {
	_, q, _ := strings.Cut(strings.TrimSpace(chord), " ")
	return q
}

// Sits says where the role sits against just, in the words musicians use:
// a third or seventh above just is sharp; a fifth whose upper note is flat
// against 3/2 above the root is narrow, one sharp of it wide; an octave
// likewise. Within 0.5 ¢ it is just (pure).
func (r Role) Sits() string {
	c := fmt.Sprintf("%.1f ¢", math.Abs(r.Mean))
	switch {
	case r.Member == "fifth" && math.Abs(r.Mean) < 0.5:
		return "pure"
	case r.Member == "root" && math.Abs(r.Mean) < 0.5:
		return "pure"
	case math.Abs(r.Mean) < 0.5:
		return "just"
	case r.Member == "fifth" && r.Mean < 0:
		return c + " narrow"
	case r.Member == "fifth":
		return c + " wide"
	case r.Member == "root" && r.Mean < 0:
		return c + " narrow"
	case r.Member == "root":
		return c + " wide"
	case r.Mean > 0:
		return c + " above just (sharp)"
	}
	return c + " below just (flat)"
}

// RoleWords is a group's chord roles in one line, those with RoleChords
// or more: "thirds in major chords sit 6.0 ¢ above just (sharp); fifths
// 1.0 ¢ narrow". Empty when none has enough.
func (g Group) RoleWords() string {
	var parts []string
	quality := ""
	for _, r := range g.Roles {
		if r.Words == "" {
			continue
		}
		p := r.Member + "s"
		if r.Member == "root" {
			p = "doubled roots" // octaves of the lowest
		}
		if r.Member == "seventh" && r.Ratio != "" {
			p += " against " + r.Ratio // which seventh is "just" is a choice
		}
		if r.Quality != quality {
			p += " in " + r.Quality + " chords"
			quality = r.Quality
		}
		if len(parts) == 0 {
			p += " sit"
		}
		parts = append(parts, fmt.Sprintf("%s %s (%d chords)", p, r.Words, r.Count))
	}
	return strings.Join(parts, "; ")
}

// Who is the group's player, or its voice: "vla", "voice 2", "Ann (voice 2)".
func (g Group) Who() string { return Who(g.Player, g.Voice) }

// Who names a player, or a --voices voice as the report heads it ("voice
// 2"; "Ann (voice 2)" where --player named the microphone too).
func Who(player, voice string) string {
	switch {
	case voice == "":
		return player
	case player == "":
		return "voice " + voice
	}
	return player + " (voice " + voice + ")"
}

// countNotes counts the entries that are notes, not chord memberships.
func countNotes(es []journal.Entry) int {
	n := 0
	for _, e := range es {
		if e.HeardChord == "" {
			n++
		}
	}
	return n
}

// writeRoles writes the group's chord roles under its notes' table, and
// its roles in words.
func writeRoles(w io.Writer, g Group) error {
	if len(g.Roles) == 0 {
		return nil
	}
	fmt.Fprintf(w, "\nchord roles (cents from just above the lowest sounding root; in words from %d chords on):\n", RoleChords)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "chord\tmember\tjust\tchords\tmean ¢\tmedian ¢\tscatter ¢\tsits")
	for _, r := range g.Roles {
		scatter := "—"
		if r.Count > 1 {
			scatter = target.Decimal(r.Scatter, 1)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%d\t%s\t%s\t%s\t%s\n", r.Quality, r.Member, cmp.Or(r.Ratio, "—"), r.Count, target.Signed(r.Mean, 1),
			target.Signed(r.Median, 1), scatter, cmp.Or(r.Words, "—"))
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if words := g.RoleWords(); words != "" {
		_, err := fmt.Fprintf(w, "%s: %s\n", cmp.Or(g.Who(), "(no player named)"), words)
		return err
	}
	return nil
}

// roleRecord is a chord role's CSV row: level chord_role, the group's
// columns, the role's count and its cents from just where the notes' rows
// have cents from target, its words as the tendency, and its chord quality,
// member and just ratio last.
func roleRecord(g Group, r Role, opt Options) []string {
	rec := make([]string, len(CSVHeader(opt)))
	set := func(col, v string) { rec[slices.Index(CSVHeader(opt), col)] = v }
	set("player", g.Player)
	set("key", g.Key)
	set("temperament", g.Temperament)
	set("a4", strconv.FormatFloat(g.A4, 'f', -1, 64))
	set("transpose", g.Transpose)
	set("chord", g.Chord)
	set("level", "chord_role")
	set("count", strconv.Itoa(r.Count))
	set("mean_cents", target.Decimal(r.Mean, 2))
	set("median_cents", target.Decimal(r.Median, 2))
	if r.Count > 1 {
		set("scatter_cents", target.Decimal(r.Scatter, 2))
	}
	set("tendency", r.Words)
	set("voice", g.Voice)
	set("chord_quality", r.Quality)
	set("member", r.Member)
	set("just_ratio", r.Ratio)
	set("anchor", g.Anchor)
	return rec
}
