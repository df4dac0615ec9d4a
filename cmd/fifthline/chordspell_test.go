package main

import (
	"path/filepath"
	"strings"
	"testing"
)

// A note heard in a chord is spelled from the chord's root, in the note rows
// and the journal as in the chord rows (interface contract, "Spelling
// window": "Where a chord is known (--chord, or heard with
// --players/--voices), its members are spelled from its root instead (G♯ as
// the third of E major in F major)"). F major's window is A♭…C♯ (the
// contract's rule), so the same pitch alone reads A♭4. The parts are E3, B3,
// G♯4 and E4 in equal temperament at A4 = 440 Hz (ISO 16; 440·2^(n/12)),
// then the G♯4 alone.
func TestNoteRowsSpellChordMembersFromTheRoot(t *testing.T) {
	t.Parallel()
	multi, mono := soxParts(t, [][]soxNote{
		{{164.8138, 0.2, 1.5, 1.6}},
		{{246.9417, 0.2, 1.5, 1.6}},
		{{415.3047, 0.2, 1.5, 0.2}, {415.3047, 0.2, 1.0, 0.2}},
		{{329.6276, 0.2, 1.5, 1.6}},
	})
	for _, c := range []struct {
		name string
		args []string
		vl2  string // the G#4's player; voices number theirs by pitch
	}{
		{"players", []string{"--players", "vc,vla,vl2,vl1", multi}, "vl2"},
		{"voices", []string{"--voices", "auto", mono}, ""},
	} {
		journal := filepath.Join(t.TempDir(), "journal.csv")
		code, out, stderr := runCLI(t, append([]string{"analyze", "--key", "F major", "--log", journal}, c.args...)...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", c.name, code, stderr)
		}
		_, rows := readCSV(t, out)
		var got []string
		for _, r := range rows {
			if r["hz"] > "415" && r["hz"] < "416" && r["player"] == c.vl2 {
				got = append(got, r["note"]+"/"+r["alt_note"])
			}
		}
		if want := "G#4/Ab4,Ab4/G#4"; strings.Join(got, ",") != want {
			t.Errorf("%s: the third of E major, then alone: %v, want %s\n%s", c.name, got, want, out)
		}
		data, logged := readCSVFile(t, journal)
		var notes []string
		for _, r := range logged {
			if r["hz"] > "415" && r["hz"] < "416" {
				notes = append(notes, r["note"])
			}
		}
		if strings.Join(notes, ",") != "G#4,Ab4" {
			t.Errorf("%s: journal has %v, want G#4 then Ab4\n%s", c.name, notes, data)
		}
	}
}

// Every command says on stderr, in one line, which tuning it uses when no
// flag set it (interface contract, "Musical flags"): analyze --voices too.
func TestAnalyzeVoicesSaysItsTuning(t *testing.T) {
	path := sox(t, "chord.wav", "-r", "44100", "-b", "16", "synth 1 sawtooth 261.63 sawtooth 327.0375 remix 1,2 gain -8")
	code, _, stderr := runCLI(t, "analyze", "--voices", "2", path)
	if code != 0 || !strings.HasPrefix(stderr, "fifthline: tuning C major") || strings.Count(stderr, "\n") != 1 {
		t.Errorf("exit %d, stderr %q: want one line saying the tuning", code, stderr)
	}
}

// listen takes one of --channel N, --players NAMES and --voices N|auto
// (interface contract, "listen"); --players says each player's channel, so
// a --channel beside it is a usage error rather than silently ignored, in
// analyze too.
func TestChannelBesidePlayersIsAUsageError(t *testing.T) {
	quartet := soxQuartet(t)
	for _, args := range [][]string{
		{"analyze", "--players", "vc,vla", "--channel", "2", quartet},
		{"listen", "--plain", "--players", "vc,vla", "--channel", "2"},
	} {
		code, out, stderr := runCLI(t, args...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, "--channel and --players cannot go together") || out != "" {
			t.Errorf("%v: %q (stdout %q)", args, stderr, out)
		}
	}
}
