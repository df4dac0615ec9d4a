package main

import (
	"cmp"
	"context"
	"math"
	"strconv"
	"strings"
	"testing"

	"fifthline/capture"
	"fifthline/harmony"
	"fifthline/internal/testsignal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// checkPlayerNotes holds note rows of the players against each part read
// alone: every lone note heard once, by its player, spelled the same and
// within the take's cents; nothing else heard (a resting player stays
// silent). With at, notes are matched by start time too (a file's
// times are the take's; live, only the order is). It returns how far each
// note matched read from its part alone, ¢.
func checkPlayerNotes(t *testing.T, how string, r renderedTake, lone [][]map[string]string, rows []map[string]string, at bool) (offs []float64) {
	t.Helper()
	heard := map[string][]map[string]string{}
	for _, row := range rows {
		heard[row["player"]] = append(heard[row["player"]], row)
	}
	worst := 0.0
	for i, p := range r.players {
		got := heard[p]
		names, want := column(got, "note"), column(lone[i], "note")
		if strings.Join(names, " ") != strings.Join(want, " ") {
			t.Errorf("%s %s: %s heard %v, alone %v", how, r.name, p, names, want)
			continue
		}
		for j, g := range got {
			l := lone[i][j]
			if at && math.Abs(parseF(g["start_s"])-parseF(l["start_s"])) > 0.1 {
				t.Errorf("%s %s: %s's %s starts at %s s, alone at %s s", how, r.name, p, g["note"], g["start_s"], l["start_s"])
			}
			off := testsignal.Cents(parseF(g["hz"]), parseF(l["hz"]))
			worst = max(worst, math.Abs(off))
			offs = append(offs, off)
			if math.Abs(off) > r.cents {
				t.Errorf("%s %s: %s's %s at %s Hz, %+.2f ¢ from its reading alone (%s Hz); allowed ±%g ¢", how, r.name, p, g["note"], g["hz"], off, l["hz"], r.cents)
			}
		}
	}
	t.Logf("%s %s: %d notes, largest error %.3f ¢ against the parts alone", how, r.name, len(rows), worst)
	return offs
}

func parseF(s string) float64 {
	x, _ := strconv.ParseFloat(s, 64)
	return x
}

// analyze --players reads every player of each rendered take from their
// own channel as they read alone.
func TestAnalyzePlayersReadsRenderedTakes(t *testing.T) {
	t.Parallel()
	forEachTake(t, ensembleTakes, func(t *testing.T, r renderedTake) { readTakeOffline(t, r) })
}

// chordRows groups --chords rows by chord: its name and each member's row
// by player.
type chordRow struct {
	name    string
	members map[string]map[string]string
}

func readChords(t *testing.T, r renderedTake, path string) []chordRow {
	t.Helper()
	code, out, stderr := runLong(t, append(append([]string{"analyze"}, r.musical()...), "--players", strings.Join(r.players, ","), "--chords", path)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	return chordRows(t, out)
}

// chordRows groups --chords CSV rows by chord.
func chordRows(t *testing.T, out string) []chordRow {
	t.Helper()
	_, rows := readCSV(t, out)
	var chords []chordRow
	for _, row := range rows {
		key := row["start_s"] + " " + row["chord"]
		if len(chords) == 0 || chords[len(chords)-1].name != key {
			chords = append(chords, chordRow{name: key, members: map[string]map[string]string{}})
		}
		chords[len(chords)-1].members[row["player"]] = row
	}
	return chords
}

// analyze --players --chords names each written chord, and every third
// and fifth reads within 1.5 ¢ of its just reading in the same take
// without bleed (the held-out check's figure; a take may say otherwise,
// and why, in chordCents); the chord written just
// reads just within the samples' own tuning, as the parts alone read it.
func TestAnalyzePlayersChordsOfRenderedTakes(t *testing.T) {
	t.Parallel()
	forEachTake(t, ensembleTakes, func(t *testing.T, r renderedTake) { checkTakeChords(t, r) })
}

// checkTakeChords reads the take's chords with and without bleed and holds
// them as TestAnalyzePlayersChordsOfRenderedTakes says; it returns the
// chords read with bleed and how far their thirds and fifths read from
// their readings without, ¢.
func checkTakeChords(t *testing.T, r renderedTake) (wet []chordRow, offs []float64) {
	t.Helper()
	wet, offs = chordsAsWithoutBleed(t, r)
	checkJustChord(t, r, wet[len(wet)-1])
	return wet, offs
}

// chordsAsWithoutBleed reads the take's chords with and without bleed:
// the written chords named both ways, every member alike, and its thirds
// and fifths within the take's chordCents (1.5 ¢ unless it says) of their
// readings without bleed. It returns the chords read with bleed and how
// far their thirds and fifths read from their readings without, ¢.
func chordsAsWithoutBleed(t *testing.T, r renderedTake) (wet []chordRow, offs []float64) {
	t.Helper()
	wet = readChords(t, r, r.wet)
	return wet, chordsAsDry(t, r, wet)
}

// chordsAsDry holds chords read with bleed to the take read without, as
// chordsAsWithoutBleed says, and returns how far their thirds and fifths
// read from their readings without, ¢.
func chordsAsDry(t *testing.T, r renderedTake, wet []chordRow) (offs []float64) {
	t.Helper()
	dry := readChords(t, r, r.dry)
	names := func(cs []chordRow) string {
		var s []string
		for _, c := range cs {
			s = append(s, strings.SplitN(c.name, " ", 2)[1])
		}
		return strings.Join(s, ", ")
	}
	if names(wet) != strings.Join(r.chords, ", ") || names(dry) != names(wet) {
		t.Fatalf("chords %s; without bleed %s; written %s", names(wet), names(dry), strings.Join(r.chords, ", "))
	}
	bar := cmp.Or(r.chordCents, 1.5)
	worst := 0.0
	for i := range wet {
		for p, m := range wet[i].members {
			d, ok := dry[i].members[p]
			if !ok || d["member"] != m["member"] || d["note"] != m["note"] {
				t.Errorf("%s: %s plays %s %s; without bleed %v", wet[i].name, p, m["member"], m["note"], d)
				continue
			}
			if m["member"] != "third" && m["member"] != "fifth" {
				continue
			}
			off := parseF(m["just_cents"]) - parseF(d["just_cents"])
			worst = max(worst, math.Abs(off))
			offs = append(offs, off)
			if math.Abs(off) > bar {
				t.Errorf("%s: %s's %s %s %+.2f ¢ from just, without bleed %+.2f ¢; allowed ±%g ¢", wet[i].name, p, m["member"], m["note"], parseF(m["just_cents"]), parseF(d["just_cents"]), bar)
			}
		}
	}
	t.Logf("%s: chords %s; thirds and fifths within %.3f ¢ of their readings without bleed", r.name, names(wet), worst)
	return offs
}

// checkJustChord holds the last chord, written just, to just as the
// renders sound it: each part's sample sits some cents from the pitch it
// was asked for (what the part alone reads over the chord's stretch, less
// its edges and a member's attack as the chord reading leaves them out:
// memberFrom), so a third or fifth is just less the root's offset plus
// its own, within 1.5 ¢ (the held-out check's figure).
func checkJustChord(t *testing.T, r renderedTake, chord chordRow) {
	t.Helper()
	offset := func(i int) float64 {
		m := chord.members[r.players[i]]
		return testsignal.Cents(r.loneOver(t, i, r.memberFrom(t, i, parseF(m["start_s"])), parseF(m["end_s"])-harmony.Edge), r.asked(i, len(r.parts[i].Notes)-1))
	}
	for i, p := range r.players {
		m, ok := chord.members[p]
		if !ok || (m["member"] != "third" && m["member"] != "fifth") {
			continue
		}
		got, want := parseF(m["just_cents"]), offset(i)-offset(0)
		if math.Abs(got-want) > 1.5 {
			t.Errorf("%s, written just: %s's %s %s reads %+.2f ¢ from just; the samples' own tuning gives %+.2f ¢", chord.name, p, m["member"], m["note"], got, want)
		}
		t.Logf("%s, written just: %s's %s %s reads %+.2f ¢ from just; the samples' own tuning gives %+.2f ¢", chord.name, p, m["member"], m["note"], got, want)
	}
}

// loneOver is the pitch part i alone holds from one time to another: the
// geometric mean of its frames there (read once per part).
func (r renderedTake) loneOver(t *testing.T, i int, from, to float64) float64 {
	t.Helper()
	sum, n := 0.0, 0
	for _, f := range r.loneFrames(t, i) {
		if at := parseF(f["time_s"]); at >= from && at <= to && parseF(f["hz"]) > 0 {
			sum += math.Log2(parseF(f["hz"]))
			n++
		}
	}
	return math.Exp2(sum / float64(max(n, 1)))
}

// memberFrom is where a chord starting at start reads part i from, as the
// chord reader reads a member (harmony's name): Edge in, or where the
// part's note settled from its attack, read alone by the one-pitch path
// (pitchdetect's Held.Settled), if that is later and the note enters on
// the chord, beginning with it or less than MinSeconds before.
func (r renderedTake) memberFrom(t *testing.T, i int, start float64) float64 {
	t.Helper()
	from := start + harmony.Edge
	held, ok := r.held[i]
	if !ok {
		held = heldAlone(t, r.lone[i])
		r.held[i] = held
	}
	for _, h := range held {
		if h.Start <= from && from <= h.End && h.Start > start-harmony.MinSeconds {
			return max(from, h.Settled)
		}
	}
	return from
}

// heldAlone is every note the one-pitch path holds in a mono file.
func heldAlone(t *testing.T, path string) []pitchdetect.Held {
	t.Helper()
	rec, err := capture.OpenRecording(path, 1)
	if err != nil {
		t.Fatal(err)
	}
	defer rec.Close()
	var held []pitchdetect.Held
	err = session.Run(context.Background(), rec, session.Options{Name: path, Tunings: session.NewTunings(target.Default()),
		OnNote: func(ev session.Event) error { held = append(held, ev.Held); return nil }})
	if err != nil {
		t.Fatal(err)
	}
	return held
}

// loneFrames is part i alone, frame by frame (read once per part).
func (r renderedTake) loneFrames(t *testing.T, i int) []map[string]string {
	t.Helper()
	rows, ok := r.frames[i]
	if !ok {
		code, out, stderr := runLong(t, append(append([]string{"analyze"}, r.musical()...), "--frames", r.lone[i])...)
		if code != 0 {
			t.Fatalf("%s alone: exit %d: %s", r.players[i], code, stderr)
		}
		_, rows = readCSV(t, out)
		r.frames[i] = rows
	}
	return rows
}

// The wind quartet played live into a four-channel interface (a
// PulseAudio null sink of four channels of this test's own, its monitor
// the input) and heard by listen --plain --players: every note found once
// by its player, spelled, and within 1 ¢ of its part's reading alone.
func TestListenPlayersHearsRenderedWindsLive(t *testing.T) {
	t.Parallel()
	hearTakeLive(t, renderTake(t, ensembleTakes[0]))
}

// readTakeOffline reads the take's multitrack with analyze --players and
// holds every player's notes to the parts read alone; it returns the parts'
// lone readings and the take's note rows.
func readTakeOffline(t *testing.T, r renderedTake) (lone [][]map[string]string, rows []map[string]string) {
	t.Helper()
	lone = r.loneNotes(t)
	rows, _ = readTakeAgainst(t, r, lone)
	return lone, rows
}

// readTakeAgainst reads the take's multitrack with analyze --players and
// holds every player's notes to truth, each part's notes as rows; it
// returns the take's note rows and how far each note matched read from
// its truth, ¢.
func readTakeAgainst(t *testing.T, r renderedTake, truth [][]map[string]string) (rows []map[string]string, offs []float64) {
	t.Helper()
	code, out, stderr := runLong(t, append(append([]string{"analyze"}, r.musical()...), "--players", strings.Join(r.players, ","), r.wet)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	_, rows = readCSV(t, out)
	return rows, checkPlayerNotes(t, "analyze", r, truth, rows, true)
}

// hearTakeLive plays the take's multitrack through a private 4-channel
// null sink into listen --plain --players and holds every player's notes
// to the parts read alone.
func hearTakeLive(t *testing.T, r renderedTake) {
	t.Helper()
	lone := r.loneNotes(t)
	out := playQuartetLive(t, r.wet, append(r.musical(), "--players", strings.Join(r.players, ","))...)
	_, rows := readCSV(t, out)
	checkPlayerNotes(t, "listen", r, lone, rows, false)
	if t.Failed() {
		t.Log(out)
	}
}
