package main

import (
	"context"
	"strings"
	"testing"

	"fifthline/capture"
	"fifthline/ensemble"
	"fifthline/session"
)

// Live there is no learning pass: listen --players learns what each
// microphone hears of the others while it listens, so a take's first
// notes sound before any bleed is known (analyze --players reads the
// first minute twice). These tests hold the strings and voices to it as
// the wind tests do: every note heard once, by its player, spelled and
// within the take's cents of its part read alone (1.5 ¢ for these
// vibrato parts, the ensemble issue's figure), resting players silent.
// The harder choir is held to it too: its bass's first F2, entering under
// the F major chord's bleed before it is learned, is read from the band
// below the tenor (ensemble/lowband.go: 0.25 ¢ from the part alone, was
// 1.9 ¢), and its tenor's first C4, whose scoop 30 ¢ sharp a wavering
// note follows, reads the same with bleed and alone now that the glide
// rule lets a glide that has arrived waver (pitchdetect/segment.go; it
// read 1.6–2.1 ¢ apart before).
var liveFirstTakes = []string{"strings", "choir", "strings-harder", "choir-harder"}

// takeNamed is the rendered take of that name.
func takeNamed(t *testing.T, name string) ensembleTake {
	t.Helper()
	for _, e := range ensembleTakes {
		if e.name == name {
			return e
		}
	}
	t.Fatalf("no take %q", name)
	return ensembleTake{}
}

// readOnce reads the take's multitrack as listen reads the interface: one
// pass, the bleed learned from nothing as it goes (no timing involved:
// the file is read block by block as the interface delivers it). Notes
// come back as CSV rows, in the order they end.
func readOnce(t *testing.T, r renderedTake) []map[string]string {
	t.Helper()
	m := musicalFlags{key: r.key, temperament: "equal", a4: "440"}
	for i := 0; i < len(r.flags); i += 2 {
		switch f := r.flags[i]; {
		case f == "--temperament" && i+1 < len(r.flags):
			m.temperament = r.flags[i+1]
		case f == "--a4" && i+1 < len(r.flags):
			m.a4 = r.flags[i+1]
		default:
			t.Fatalf("%s: readOnce reads --temperament and --a4 only, not %v", r.name, r.flags)
		}
	}
	tu, err := m.tuning()
	if err != nil {
		t.Fatal(err)
	}
	rec, err := capture.OpenRecording(r.wet, 1)
	if err != nil {
		t.Fatal(err)
	}
	defer rec.Close()
	players, err := ensemble.ParsePlayers(strings.Join(r.players, ","))
	if err != nil {
		t.Fatal(err)
	}
	var rows []map[string]string
	o := ensemble.Options{Name: r.wet, Players: players, Tunings: session.NewTunings(tu),
		OnNote: func(n ensemble.Note) error {
			row := map[string]string{"player": n.Player.Name}
			for k, v := range n.Record(false) {
				row[session.Columns[k]] = v
			}
			rows = append(rows, row)
			return nil
		}}
	if err := ensemble.Run(context.Background(), rec, o); err != nil {
		t.Fatal(err)
	}
	return rows
}

// checkReadOnce reads the take once (readOnce) and holds every player's
// notes to the parts read alone, in order (checkPlayerNotes); it returns
// how far each note matched read from its part alone, ¢.
func checkReadOnce(t *testing.T, r renderedTake) []float64 {
	t.Helper()
	return checkPlayerNotes(t, "read once", r, r.loneNotes(t), readOnce(t, r), false)
}

// Read once, as live, from the file: the same reading as the interface
// gives, without a sink (a cello's D3 entering under the viola's A3 was
// heard first as D2, the period the two share, before the bleed was
// learned).
func TestPlayersReadOnceHearStringsAndVoices(t *testing.T) {
	t.Parallel()
	for _, name := range liveFirstTakes {
		checkReadOnce(t, renderTake(t, takeNamed(t, name)))
	}
}

// The same takes played live into a four-channel interface (a PulseAudio
// null sink of this test's own, its monitor the input) and heard by
// listen --plain --players.
func TestListenPlayersHearsStringsAndVoicesLive(t *testing.T) {
	t.Parallel()
	for _, name := range liveFirstTakes {
		hearTakeLive(t, renderTake(t, takeNamed(t, name)))
	}
}
