package report

import (
	"strings"
	"testing"
	"time"

	"fifthline/journal"
	"fifthline/target"
)

// quartetTake is one take of a string quartet given as --players
// vc,vla,vl2,vl1 (channels 1–4), the first violin playing first and the
// cello last (our own scenario): C major's C3 G3 E4 C5 in equal
// temperament at A4 = 440 Hz (ISO 16), each held 2 s, then the same again.
func quartetTake(withChannels bool) []journal.Entry {
	parts := []struct {
		player, note string
		channel      int
		at           float64
	}{{"vl1", "C5", 4, 0}, {"vl2", "E4", 3, 0.2}, {"vla", "G3", 2, 0.4}, {"vc", "C3", 1, 0.6}}
	tu := target.Default()
	began := time.Date(2026, 11, 20, 19, 0, 0, 0, time.UTC)
	var es []journal.Entry
	for again := range 2 {
		for _, p := range parts {
			n, _ := target.ParseNote(p.note)
			start := p.at + 3*float64(again)
			e := journal.Entry{Time: began.Add(time.Duration(start * float64(time.Second))), Session: "s1", Source: "take.wav",
				Player: p.player, Key: "C major", Temperament: "equal", A4: 440, Start: start, End: start + 2,
				Note: n, Hz: tu.Target(n), TargetHz: tu.Target(n)}
			if withChannels {
				e.Channel = p.channel
			}
			es = append(es, e)
		}
	}
	return es
}

// Players are listed in the order they sit, as the group gave them
// (--players vc,vla,vl2,vl1: the journal's channel column), not
// alphabetically ("vc vl1 vl2 vla") nor by who played first; a journal
// without channels keeps the order the players first appear in.
func TestReportSeatsPlayersInTheirChannelOrder(t *testing.T) {
	for _, tc := range []struct {
		channels bool
		want     string
	}{{true, "vc vla vl2 vl1"}, {false, "vl1 vl2 vla vc"}} {
		es := quartetTake(tc.channels)
		var got []string
		for _, g := range Summarize(es, Options{Tolerance: 5}) {
			got = append(got, g.Player)
		}
		if strings.Join(got, " ") != tc.want {
			t.Errorf("channels %v: tables for %q, want %q", tc.channels, got, tc.want)
		}
		drifts := GroupDrifts(es)
		if len(drifts) != 1 || strings.Join(drifts[0].Players, " ") != tc.want {
			t.Errorf("channels %v: the group line's players %+v, want %q", tc.channels, drifts, tc.want)
		}
	}
}

// The group's drift line counts notes, not a chord's membership rows (the
// same notes read again within their chords), and reads the chords'
// sevenths as the journal says they were read: a G dominant seventh in
// equal temperament (ISO 16, A4 = 440 Hz) samples its members' cents from
// just, 0, +13.7, −2.0 and the seventh's +3.9 against 16/9 or +31.2
// against 7/4 (common practice), whose median is the drift: 2.0 or 6.8 ¢.
func TestGroupDriftCountsNotesAndReadsSeventhsAsTheJournalSays(t *testing.T) {
	tu := target.Default()
	began := time.Date(2026, 11, 20, 19, 0, 0, 0, time.UTC)
	notes := map[string]string{"b": "G3", "t": "B3", "a": "D4", "s": "F4"}
	var hz []float64
	var es []journal.Entry
	for _, p := range []string{"b", "t", "a", "s"} {
		n, _ := target.ParseNote(notes[p])
		hz = append(hz, tu.Target(n))
		es = append(es, journal.Entry{Time: began, Session: "s1", Source: "take.wav", Player: p, Key: "C major",
			Temperament: "equal", A4: 440, Start: 0, End: 5, Note: n, Hz: tu.Target(n), TargetHz: tu.Target(n)})
	}
	for _, c := range []struct {
		seventh float64
		words   string
	}{{16.0 / 9, "group drift 2.0 ¢ sharp"}, {7.0 / 4, "group drift 6.8 ¢ sharp"}} {
		hc, _ := tu.NameChord(hz, c.seventh)
		all := append([]journal.Entry(nil), es...)
		for _, m := range hc.Members {
			e := es[m.Index]
			e.HeardChord, e.Member, e.JustCents, e.JustRatio, e.Reference = hc.Name(), m.Role, m.JustCents, m.Just, m.Role == "root"
			all = append(all, e)
		}
		d := GroupDrifts(all)
		if len(d) != 1 || d[0].Notes != 4 || !strings.HasPrefix(d[0].Words, c.words) {
			t.Errorf("seventh %.4f: %+v, want 4 notes and %q", c.seventh, d, c.words)
		}
	}
}

// A --voices journal's voices are listed by number, voice 1 (the lowest)
// first, as the group meter's rows and analyze's voice column count them,
// not in the order their first notes ended (here voice 3's first: our own
// take, C major's C3 G3 E4 as voices 1–3, the E4 released first).
func TestReportListsVoicesLowestFirst(t *testing.T) {
	es := quartetTake(false)[:3] // vl1 C5, vl2 E4, vla G3: ended in that order
	for i, v := range []string{"3", "2", "1"} {
		es[i].Player, es[i].Voice = "", v
	}
	var got []string
	for _, g := range Summarize(es, Options{Tolerance: 5}) {
		got = append(got, g.Voice)
	}
	if strings.Join(got, " ") != "1 2 3" {
		t.Errorf("voices listed %q, want 1 2 3", got)
	}
}
