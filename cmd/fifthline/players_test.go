package main

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"fifthline/internal/vmic"
)

// soxQuartet is a 4-channel take (soxParts) of parts in equal temperament
// at A4 = 440 Hz (ISO 16; frequencies from 440·2^(n/12)): C major over C3,
// then G major over G2; the first violin rests for the first 0.8 s.
func soxQuartet(t *testing.T) string {
	multi, _ := soxParts(t, [][]soxNote{
		{{130.8128, 0.2, 1.5, 0.1}, {97.9989, 0, 1.5, 0.2}},
		{{195.9977, 0.2, 3.1, 0.2}},
		{{329.6276, 0.2, 1.5, 0.1}, {293.6648, 0, 1.5, 0.2}},
		{{523.2511, 0.8, 0.9, 0.1}, {493.8833, 0, 1.5, 0.2}},
	})
	return multi
}

// soxNote is one sawtooth note of a part: hz for seconds, with silence
// before and after it.
type soxNote struct{ hz, before, seconds, after float64 }

// soxParts renders one sawtooth part per channel as sox synthesises it,
// and mixes them (soxMix).
func soxParts(t *testing.T, parts [][]soxNote) (multi, mono string) {
	t.Helper()
	dir := t.TempDir()
	f := func(x float64) string { return strconv.FormatFloat(x, 'f', 4, 64) }
	var dry []string
	for i, notes := range parts {
		var files []string
		for k, n := range notes {
			p := filepath.Join(dir, strconv.Itoa(i)+"-"+strconv.Itoa(k)+".wav")
			soxTB(t, "-n", "-r", "48000", "-b", "24", p, "synth", f(n.seconds), "sawtooth", f(n.hz), "fade", "0.02", f(n.seconds), "0.02",
				"vol", "0.25", "pad", f(n.before), f(n.after))
			files = append(files, p)
		}
		p := filepath.Join(dir, "part"+strconv.Itoa(i)+".wav")
		soxTB(t, append(files, p)...)
		dry = append(dry, p)
	}
	return soxMix(t, dir, dry)
}

// soxMix writes a multichannel take of mono parts (the dry files, one a
// channel) with the others' bleed (soxBleed), and the dry parts summed
// onto one channel, as one microphone hears them.
func soxMix(t testing.TB, dir string, dry []string) (multi, mono string) {
	t.Helper()
	multi, mono = filepath.Join(dir, "quartet.wav"), filepath.Join(dir, "mono.wav")
	soxBleed(t, dir, dry, multi)
	soxTB(t, append(append([]string{"-m"}, dry...), "-b", "24", mono)...)
	return multi, mono
}

// soxBleed mixes one part per channel into a multichannel take, each
// channel hearing every other part 20 dB down (×0.1) and 3 ms late, as
// close microphones hear their neighbours (15–25 dB down, a few
// milliseconds late: the ensemble issue's measurements). sox does the
// mixing.
func soxBleed(t testing.TB, dir string, dry []string, out string) {
	t.Helper()
	var late []string
	for i, p := range dry {
		d := filepath.Join(dir, "late"+strconv.Itoa(i)+".wav")
		soxTB(t, p, d, "pad", "0.003")
		late = append(late, d)
	}
	args := append(append(append([]string{"-M"}, dry...), late...), "-b", "24", out, "remix")
	for c := range dry {
		mix := []string{strconv.Itoa(c + 1)}
		for o := range dry {
			if o != c {
				mix = append(mix, strconv.Itoa(len(dry)+1+o)+"v0.1")
			}
		}
		args = append(args, strings.Join(mix, ","))
	}
	soxTB(t, args...)
}

// Each player is read from their own channel: every note spelled right
// and within 1 ¢ of what sox was asked for (the held-out check's figure),
// the resting first violin silent until she enters, rows ordered by
// start_s with player and channel columns (interface contract).
func TestAnalyzePlayersReadsEachFromTheirOwnChannel(t *testing.T) {
	t.Parallel()
	path := soxQuartet(t)
	log := filepath.Join(t.TempDir(), "rehearsal.csv")
	code, out, stderr := runCLI(t, "analyze", "--players", "vc,vla,vl2,vl1", "--log", log, path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	if strings.Join(header[len(header)-2:], ",") != "player,channel" {
		t.Fatalf("header %v", header)
	}
	want := []struct {
		player, channel, note string
		start, hz             float64
	}{
		{"vc", "1", "C3", 0.2, 130.8128}, {"vla", "2", "G3", 0.2, 195.9977}, {"vl2", "3", "E4", 0.2, 329.6276},
		{"vl1", "4", "C5", 0.8, 523.2511},
		{"vc", "1", "G2", 1.8, 97.9989}, {"vl2", "3", "D4", 1.8, 293.6648}, {"vl1", "4", "B4", 1.8, 493.8833},
	}
	if len(rows) != len(want) {
		t.Fatalf("%d notes, want %d:\n%s", len(rows), len(want), out)
	}
	last := 0.0
	for _, w := range want {
		found := false
		for _, r := range rows {
			start, _ := strconv.ParseFloat(r["start_s"], 64)
			hz, _ := strconv.ParseFloat(r["hz"], 64)
			if r["player"] == w.player && r["note"] == w.note && math.Abs(start-w.start) < 0.1 {
				found = true
				if r["channel"] != w.channel || math.Abs(1200*math.Log2(hz/w.hz)) > 1 {
					t.Errorf("%s %s: channel %s, %.4f Hz; want channel %s, %.4f Hz", w.player, w.note, r["channel"], hz, w.channel, w.hz)
				}
			}
		}
		if !found {
			t.Errorf("%s's %s from %.1f s not heard:\n%s", w.player, w.note, w.start, out)
		}
	}
	for _, r := range rows {
		start, _ := strconv.ParseFloat(r["start_s"], 64)
		if start < last {
			t.Errorf("rows not ordered by start_s:\n%s", out)
		}
		last = start
	}
	// The journal has one row per player's note, under the player's name.
	_, jrows := readCSVFile(t, log)
	players := map[string]int{}
	for _, r := range jrows {
		players[r["player"]]++
	}
	if len(jrows) != len(want) || players["vc"] != 2 || players["vla"] != 1 || players["vl1"] != 2 {
		t.Errorf("journal players %v in %d rows", players, len(jrows))
	}
}

// The chords the players make, member by member: the third of C major read
// 13.69 ¢ above just above the C actually sounding, the fifth 1.96 ¢ below
// (equal temperament's third and fifth against 5/4 and 3/2: 400 − 386.31
// and 700 − 701.96 ¢, from the definitions).
func TestAnalyzePlayersChords(t *testing.T) {
	t.Parallel()
	code, out, stderr := runCLI(t, "analyze", "--players", "vc,vla,vl2,vl1", "--chords", soxQuartet(t))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	if strings.Join(header, ",") != "start_s,end_s,chord,member,note,hz,cents,just_cents,player" {
		t.Fatalf("header %v", header)
	}
	chords := map[string]bool{}
	for _, r := range rows {
		chords[r["chord"]] = true
		just, _ := strconv.ParseFloat(r["just_cents"], 64)
		want := map[string]float64{"root": 0, "third": 13.69, "fifth": -1.96}[r["member"]]
		if math.Abs(just-want) > 1 {
			t.Errorf("%s %s %s (%s): %+.2f ¢ from just, want %+.2f", r["chord"], r["member"], r["note"], r["player"], just, want)
		}
	}
	if !chords["C major"] || !chords["G major"] || len(chords) != 2 {
		t.Errorf("chords %v:\n%s", chords, out)
	}
}

// Bad --players: one line, exit 2 (interface contract), saying how many
// channels the file has.
func TestAnalyzePlayersUsageErrors(t *testing.T) {
	mono := sox(t, "mono.wav", "-r", "48000", "synth 1 sine 440")
	quartet := soxQuartet(t)
	for _, c := range []struct {
		args []string
		says string
	}{
		{[]string{"--players", "a,b,c,d,e", quartet}, "has 4 channels"},
		{[]string{"--players", "vc,vc", quartet}, "named twice"},
		{[]string{"--players", "vc,vla", mono}, "one channel"},
		{[]string{"--players", "vc,vla", "--voices", "2", quartet}, "cannot go together"},
		{[]string{"--players", "vc,vla", "--frames", quartet}, "cannot go together"},
		// Names parted by spaces or semicolons are a list, not one name.
		{[]string{"--players", "vc vla vl2 vl1", quartet}, "--players vc,vla,vl2,vl1"},
		{[]string{"--players", "vc;vla", quartet}, "--players vc,vla"},
		// A lone name with a space may be one player or a list: the error
		// says both (one player is --player's).
		{[]string{"--players", "first violin", quartet}, `for 2 players, --players first,violin; for one player, --player "first violin"`},
	} {
		code, out, stderr := runCLI(t, append([]string{"analyze"}, c.args...)...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, c.says) || out != "" {
			t.Errorf("%v: %q (stdout %q), want it to say %q", c.args, stderr, out, c.says)
		}
	}
}

// The same quartet played live into a four-channel interface (a PulseAudio
// null sink with four channels, its monitor the input) and heard by
// listen --plain --players: the file's reading, live. The bleed is learned
// while listening, so the first notes may come before it is known; what
// the test holds is every player's notes spelled and within 1 ¢ and the
// resting violin silent until she enters.
func TestListenPlayersHearsTheQuartetLive(t *testing.T) {
	t.Parallel()
	out := playQuartetLive(t, soxQuartet(t), "--players", "vc,vla,vl2,vl1")
	header, rows := readCSV(t, out)
	if strings.Join(header[len(header)-2:], ",") != "player,channel" {
		t.Fatalf("header %v", header)
	}
	want := map[string][]string{"vc": {"C3", "G2"}, "vla": {"G3"}, "vl2": {"E4", "D4"}, "vl1": {"C5", "B4"}}
	got := map[string][]string{}
	for _, row := range rows {
		got[row["player"]] = append(got[row["player"]], row["note"])
		if c, _ := strconv.ParseFloat(row["cents"], 64); math.Abs(c) > 1 {
			t.Errorf("%s %s read %+.2f ¢ from equal temperament", row["player"], row["note"], c)
		}
	}
	for p, notes := range want {
		if strings.Join(got[p], " ") != strings.Join(notes, " ") {
			t.Errorf("%s played %v, heard %v:\n%s", p, notes, got[p], out)
		}
	}
}

// Three players on a four-channel interface: a sound server (PulseAudio
// here) remixes a stream whose channel count differs from its source's,
// and a three-channel stream of this four-channel sink heard nothing of
// the third player's rear-left channel (measured), so it reads only when
// the stream opens all four, which --input-channels asks for.
func TestListenPlayersOpensTheInterfacesChannels(t *testing.T) {
	t.Parallel()
	out := playQuartetLive(t, soxQuartet(t), "--players", "vc,vla,vl2", "--input-channels", "4")
	_, rows := readCSV(t, out)
	var vl2 []string
	for _, row := range rows {
		if row["player"] == "vl2" {
			vl2 = append(vl2, row["note"])
		}
	}
	if strings.Join(vl2, " ") != "E4 D4" {
		t.Errorf("vl2 on channel 3 played E4 D4, heard %v:\n%s", vl2, out)
	}
}

// playQuartetLive plays a 4-channel take into a four-channel null sink of
// the test's own (its monitor the input) while listen --plain runs with
// args, stops it with Ctrl-C once the take has played and returns what it
// wrote. It leaves the environment alone, so its tests run in parallel.
func playQuartetLive(t *testing.T, take string, args ...string) string {
	t.Helper()
	mic := vmic.PrivateChannels(t, fourChannels...)
	wait, proc := startPlainProcess(t, mic.Env(), append(args, "--duration", "120s")...)
	if err := mic.PlayChannels(take)(); err != nil { // returns once the take has played
		t.Fatal(err)
	}
	time.Sleep(700 * time.Millisecond) // the last notes' release reaches the input
	return stopPlain(t, proc, wait)
}

// JSON rows are the CSV's columns, typed: numbers as numbers, the player
// and channel with every note, the player with every chord member.
func TestAnalyzePlayersJSON(t *testing.T) {
	t.Parallel()
	path := soxQuartet(t)
	for _, args := range [][]string{{}, {"--chords"}} {
		code, out, stderr := runLong(t, append([]string{"analyze", "--players", "vc,vla,vl2,vl1", "--format", "json"}, append(args, path)...)...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		var rows []map[string]any
		if err := json.Unmarshal([]byte(out), &rows); err != nil || len(rows) == 0 {
			t.Fatalf("%v: not a JSON array of rows (%v):\n%s", args, err, out)
		}
		for _, r := range rows {
			if _, ok := r["hz"].(float64); !ok || r["player"] == nil || r["file"] != nil {
				t.Errorf("%v: row %v", args, r)
			}
		}
	}
}
