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
