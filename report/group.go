package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"time"

	"fifthline/ensemble"
	"fifthline/journal"
	"fifthline/target"
)

// The group's drift, from a journal: for each take that two or more
// players wrote into (one session and source, one key, temperament and
// reference), how far the whole group moved from the reference over the
// take, with each chord's own just tuning taken out (package ensemble
// defines it), apart from the per-note tables, which keep each note's
// cents against the fixed reference.

// GroupDrift is the group's drift over one take.
type GroupDrift struct {
	Source      string    `json:"source"`
	Session     string    `json:"session"`
	Players     []string  `json:"players"` // in the order they sit (seating.go)
	Key         string    `json:"key"`
	Temperament string    `json:"temperament"`
	Anchor      string    `json:"anchor"` // a4 or tonic, as the notes' rows say
	A4          float64   `json:"a4"`
	Began       time.Time `json:"began"`
	Notes       int       `json:"notes"`
	Known       bool      `json:"known"`
	StartCents  float64   `json:"start_cents"` // + sharp, − flat
	EndCents    float64   `json:"end_cents"`
	Minutes     float64   `json:"span_min"` // between the first and last readings
	// How the chords were tuned inside themselves: mean |just_cents|.
	ThirdsCents float64 `json:"thirds_just_cents"`
	FifthsCents float64 `json:"fifths_just_cents"`
	Words       string  `json:"words"`
}

// Drift is how far the group moved over the take, + sharp, − flat.
func (g GroupDrift) Drift() float64 { return g.EndCents - g.StartCents }

// take is what keeps one take's notes together.
type take struct {
	session, source, key, temperament, anchor string
	a4                                        float64
}

// GroupDrifts reads the group's drift over every take with two or more
// players, in the order the takes first appear. Notes keep their concert
// pitch (hz), so players with different transpositions share a take.
func GroupDrifts(entries []journal.Entry) []GroupDrift {
	var order []take
	notes := map[take][]journal.Entry{}
	for _, e := range entries {
		k := take{e.Session, e.Source, e.Key, e.Temperament, e.Anchor, e.A4}
		if _, ok := notes[k]; !ok {
			order = append(order, k)
		}
		notes[k] = append(notes[k], e)
	}
	var out []GroupDrift
	for _, k := range order {
		if g, ok := groupDrift(k, notes[k]); ok {
			out = append(out, g)
		}
	}
	return out
}

func groupDrift(k take, es []journal.Entry) (GroupDrift, bool) {
	g := GroupDrift{Source: k.source, Session: k.session, Key: k.key, Temperament: k.temperament, Anchor: k.anchor, A4: k.a4}
	sounding := make([]ensemble.Sounding, 0, len(es))
	seventh := target.DefaultSeventh
	for _, e := range es {
		if e.HeardChord != "" {
			// A membership row is a note already counted, read again within
			// its chord; its seventh says what the chords were read with.
			if r, err := target.ParseSeventh(e.JustRatio); e.Member == "seventh" && err == nil {
				seventh = r
			}
			continue
		}
		g.Notes++
		if !slices.Contains(g.Players, e.Player) {
			g.Players = append(g.Players, e.Player)
		}
		if g.Began.IsZero() || e.Time.Before(g.Began) {
			g.Began = e.Time
		}
		sounding = append(sounding, ensemble.Sounding{Start: e.Start, End: e.End, Hz: e.Hz})
	}
	if len(g.Players) < 2 {
		return g, false
	}
	seatPlayers(g.Players, channels(es))
	tu, err := tuningOfTake(k)
	if err != nil {
		return g, false // a journal's tuning it cannot read again says nothing of drift
	}
	td := ensemble.DriftOver(sounding, tu, seventh)
	g.Words = td.Words()
	first, last, ok := td.Ends()
	if ok {
		g.Known, g.StartCents, g.EndCents, g.Minutes = true, first.Cents, last.Cents, (last.Time-first.Time)/60
	}
	g.ThirdsCents, g.FifthsCents = td.Inside.Thirds, td.Inside.Fifths
	return g, true
}

// tuningOfTake is the take's tuning at concert pitch.
func tuningOfTake(k take) (target.Tuning, error) {
	tu := target.Default()
	var err error
	if tu.Key, err = target.ParseKey(k.key); err != nil {
		return tu, err
	}
	if tu.Temperament, err = target.ParseTemperament(k.temperament); err != nil {
		return tu, err
	}
	if k.a4 > 0 {
		tu.A4 = k.a4
	}
	return tu, nil
}

// WriteGroupText writes the group-drift section, a line per take; nothing
// when no take had two players.
func WriteGroupText(w io.Writer, drifts []GroupDrift) error {
	if len(drifts) == 0 {
		return nil
	}
	fmt.Fprintln(w, "\nThe group together (each chord's own just tuning taken out; the tables above are each note against the fixed reference):")
	for _, g := range drifts {
		if _, err := fmt.Fprintf(w, "%s, %s (%s): %s\n", g.Source, g.Began.Format("2006-01-02 15:04"), strings.Join(g.Players, " "), g.Words); err != nil {
			return err
		}
	}
	return nil
}

// GroupLevel is the level column of the CSV's group-drift rows.
const GroupLevel = "group_drift"

// WriteGroupCSV appends a row per take to the report's CSV (after
// WriteCSV, under its header): the players joined by "+", the take's
// tuning, level group_drift, the notes counted, and the drift in the trend
// columns (slope, drift_cents, span_min, trend); the rest empty.
func WriteGroupCSV(w io.Writer, drifts []GroupDrift, opt Options) error {
	cw := csv.NewWriter(w)
	head := CSVHeader(opt)
	for _, g := range drifts {
		r := make([]string, len(head))
		set := func(col, v string) { r[slices.Index(head, col)] = v }
		set("player", strings.Join(g.Players, "+"))
		set("key", g.Key)
		set("temperament", g.Temperament)
		set("a4", strconv.FormatFloat(g.A4, 'f', -1, 64))
		set("anchor", g.Anchor)
		set("level", GroupLevel)
		set("count", strconv.Itoa(g.Notes))
		if opt.ByRehearsal {
			set("rehearsal", g.Began.Format("2006-01-02"))
		}
		set("span_min", target.Decimal(g.Minutes, 2))
		set("trend", g.Words)
		if g.Known {
			set("drift_cents", target.Decimal(g.Drift(), 2))
			if g.Minutes > 0 {
				set("slope_cents_per_min", target.Decimal(g.Drift()/g.Minutes, 4))
			}
		}
		cw.Write(r)
	}
	cw.Flush()
	return cw.Error()
}
