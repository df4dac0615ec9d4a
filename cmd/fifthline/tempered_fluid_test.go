package main

import (
	"math"
	"strings"
	"testing"

	"fifthline/harmony"
	"fifthline/internal/testsignal"
)

// analyze --players --chords --temperament T --a4 F --key K reads the
// tempered takes (each rendered once for all the checks): every note of
// every player heard by its player and spelled as written, within 1 ¢ of
// its part read alone; its cents against the temperament within 1 ¢ of
// where the MIDI Tuning Standard put it, less the instrument's own offset
// (what the part alone reads from its tuned pitch); every chord named and
// each member spelled as written; and each third's and fifth's just_cents,
// less the instruments' own offsets, the temperament's published distance
// from just within 1.5 ¢ (¼-comma meantone: major thirds 0, fifths
// −5.38 ¢).
func TestAnalyzePlayersReadsTemperedTakes(t *testing.T) {
	t.Parallel()
	for _, tt := range temperedTakes {
		t.Run(tt.name, func(t *testing.T) {
			take, pub := tt.ensemble(t)
			r := renderTake(t, take)
			lone, rows := readTakeOffline(t, r)
			checkTemperedCents(t, r, pub, lone, rows)
			checkTemperedChords(t, tt, r, pub, lone, readChords(t, r, r.wet))
		})
	}
}

// checkTemperedCents holds each note row's cents against the temperament
// to the published pitch's distance from the MIDI Tuning Standard's (its
// three-byte word: under 0.01 ¢) plus the instrument's own offset.
func checkTemperedCents(t *testing.T, r renderedTake, pub [][]float64, lone [][]map[string]string, rows []map[string]string) {
	t.Helper()
	seen := map[string]int{}
	worst := 0.0
	for _, row := range rows {
		i := indexOf(r.players, row["player"])
		j := seen[row["player"]]
		seen[row["player"]]++
		if i < 0 || j >= len(pub[i]) {
			continue // checkPlayerNotes says what is wrong
		}
		own := testsignal.Cents(parseF(lone[i][j]["hz"]), r.asked(i, j))
		want := testsignal.Cents(r.asked(i, j), pub[i][j]) + own
		off := parseF(row["cents"]) - want
		worst = max(worst, math.Abs(off))
		if math.Abs(off) > 1 {
			t.Errorf("%s: %s's %s reads %s ¢ against the temperament; its tuning and own offset (%+.2f ¢) put it at %+.2f ¢", r.name, row["player"], row["note"], row["cents"], own, want)
		}
	}
	t.Logf("%s: notes' cents against the temperament within %.3f ¢ of where the tuning put them", r.name, worst)
}

func indexOf(s []string, x string) int {
	for i, v := range s {
		if v == x {
			return i
		}
	}
	return -1
}

// checkTemperedChords: the written chords named, every member spelled as
// written with its cents against the temperament within 1 ¢ of the
// instrument's own offset over the chord, and every third and fifth its
// temperament's distance from just (tt.fromJust) within 1.5 ¢ once the
// instruments' own offsets over the chord are taken out.
func checkTemperedChords(t *testing.T, tt temperedTake, r renderedTake, pub [][]float64, lone [][]map[string]string, chords []chordRow) {
	t.Helper()
	var names []string
	for _, c := range chords {
		names = append(names, strings.SplitN(c.name, " ", 2)[1])
	}
	if strings.Join(names, ", ") != strings.Join(tt.chords, ", ") {
		t.Fatalf("%s: chords %s, written %s", r.name, strings.Join(names, ", "), strings.Join(tt.chords, ", "))
	}
	worstCents, worstJust := 0.0, 0.0
	for c, chord := range chords {
		// own is a member's offset over the chord: its part alone there
		// (within the note it reads alone, without the attack) against the
		// published pitch of the note written there.
		own := func(p string) (written string, cents float64) {
			i, m := indexOf(r.players, p), chord.members[p]
			from, to := r.memberFrom(t, i, parseF(m["start_s"])), parseF(m["end_s"])-harmony.Edge
			mid := (from+to)/2 - leadIn
			for j, n := range tt.notes[i] {
				if n.start <= mid && mid <= n.start+n.seconds {
					from, to = max(from, parseF(lone[i][j]["start_s"])), min(to, parseF(lone[i][j]["end_s"]))
					return n.name, testsignal.Cents(r.loneOver(t, i, from, to), pub[i][j])
				}
			}
			t.Fatalf("%s: %s plays nothing written at %.2f s", tt.chords[c], p, mid)
			return "", 0
		}
		root, rootHz := "", math.Inf(1)
		for p, m := range chord.members {
			if m["member"] == "root" && parseF(m["hz"]) < rootHz {
				root, rootHz = p, parseF(m["hz"])
			}
		}
		_, rootOwn := own(root)
		for p, m := range chord.members {
			written, mine := own(p)
			if m["note"] != written {
				t.Errorf("%s: %s's %s spelled %s, written %s", tt.chords[c], p, m["member"], m["note"], written)
			}
			off := parseF(m["cents"]) - mine
			worstCents = max(worstCents, math.Abs(off))
			if math.Abs(off) > 1 {
				t.Errorf("%s: %s's %s %s reads %s ¢ against the temperament; its own offset there is %+.2f ¢", tt.chords[c], p, m["member"], m["note"], m["cents"], mine)
			}
			if m["member"] != "third" && m["member"] != "fifth" {
				continue
			}
			want, ok := tt.fromJust[tt.chords[c]+" "+m["member"]]
			if !ok {
				t.Fatalf("%s: no published distance from just for its %s", tt.chords[c], m["member"])
			}
			got := parseF(m["just_cents"]) - (mine - rootOwn)
			worstJust = max(worstJust, math.Abs(got-want))
			t.Logf("%s: %s's %s %s %+.2f ¢ from just; less the offsets (%+.2f, root %+.2f) %+.2f ¢, published %+.2f ¢", tt.chords[c], p, m["member"], m["note"], parseF(m["just_cents"]), mine, rootOwn, got, want)
			if math.Abs(got-want) > 1.5 {
				t.Errorf("%s: %s's %s %s sits %+.2f ¢ from just once the offsets are out; the temperament's is %+.2f ¢", tt.chords[c], p, m["member"], m["note"], got, want)
			}
		}
	}
	t.Logf("%s: chords %s; members within %.3f ¢ of their offsets, thirds and fifths within %.3f ¢ of the published distances from just", r.name, strings.Join(names, ", "), worstCents, worstJust)
}

// The ¼-comma meantone take played live into a four-channel interface (a
// PulseAudio null sink of this test's own, its monitor the input) and
// heard by listen --plain --players: every note found once by its player,
// spelled as written, within 1 ¢ of its part's reading alone and its cents
// against the temperament within 1 ¢ of where the tuning put it.
func TestListenPlayersHearsTemperedTakeLive(t *testing.T) {
	t.Parallel()
	take, pub := temperedTakes[0].ensemble(t)
	r := renderTake(t, take)
	lone := r.loneNotes(t)
	out := playQuartetLive(t, r.wet, append(r.musical(), "--players", strings.Join(r.players, ","))...)
	_, rows := readCSV(t, out)
	checkPlayerNotes(t, "listen", r, lone, rows, false)
	checkTemperedCents(t, r, pub, lone, rows)
	if t.Failed() {
		t.Log(out)
	}
}
