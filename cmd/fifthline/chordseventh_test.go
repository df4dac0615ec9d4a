package main

import (
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// One minor seventh (interface contract, --chords: "sevenths 16/9 unless
// --seventh says otherwise"; --seventh with --chord: docs/interface.md,
// Additions): --chord "G 7" tunes its seventh at 16/9, 9/5 or 7/4 above
// G's tempered target, and a heard G dominant seventh played at those
// targets reads its seventh just under the same flags. Cents from the
// ratios: 1200·log2(16/9) = 996.090, 9/5 = 1017.596, 7/4 = 968.826 (common
// practice); the third and fifth at 5/4 and 3/2 (common practice).
func TestDeclaredChordSeventhIsTheHeardRowsSeventh(t *testing.T) {
	t.Parallel()
	temperament := []string{"--temperament", "meantone:1/4"}
	_, out, _ := runCLI(t, append([]string{"targets", "--format", "csv"}, temperament...)...)
	g3 := hzOf(t, out, "G4") / 2 // the root's tempered target, an octave down
	for _, tc := range []struct {
		flags    []string
		cents    float64
		fraction string
	}{
		{nil, 996.090, "16/9"},
		{[]string{"--seventh", "16/9"}, 996.090, "16/9"},
		{[]string{"--seventh", "9/5"}, 1017.596, "9/5"},
		{[]string{"--seventh", "7/4"}, 968.826, "7/4"},
	} {
		flags := append(append([]string{}, temperament...), tc.flags...)
		code, out, stderr := runCLI(t, append([]string{"targets", "--format", "csv", "--chord", "G 7"}, flags...)...)
		if code != 0 {
			t.Fatalf("targets %v: exit %d: %s", flags, code, stderr)
		}
		f4 := hzOf(t, out, "F4")
		if got := 1200 * math.Log2(f4/g3); math.Abs(got-tc.cents) > 0.01 {
			t.Errorf("%v: F4 %.3f ¢ above G3's tempered target, want %.3f", flags, got, tc.cents)
		}
		if _, rows := readCSV(t, out); rowOf(rows, "F4")["chord_ratio"] != tc.fraction {
			t.Errorf("%v: F4's chord_ratio %q, want %s", flags, rowOf(rows, "F4")["chord_ratio"], tc.fraction)
		}
		// The chord played at the declared targets, one part a channel.
		var parts [][]soxNote
		for _, hz := range []float64{g3, g3 * 5 / 4, g3 * 3 / 2, f4} {
			parts = append(parts, []soxNote{{hz, 0.1, 1.5, 0.1}})
		}
		take, _ := soxParts(t, parts)
		code, out, stderr = runCLI(t, append(append([]string{"analyze", "--players", "b,t,a,s", "--chords"}, flags...), take)...)
		if code != 0 {
			t.Fatalf("analyze %v: exit %d: %s", flags, code, stderr)
		}
		_, rows := readCSV(t, out)
		seventh := false
		for _, r := range rows {
			just, _ := strconv.ParseFloat(r["just_cents"], 64)
			if r["chord"] != "G dominant seventh" || math.Abs(just) > 1 {
				t.Errorf("%v: %s %s %s %+.2f ¢ from just, want G dominant seventh, just", flags, r["chord"], r["member"], r["note"], just)
			}
			seventh = seventh || r["member"] == "seventh"
		}
		if !seventh {
			t.Errorf("%v: no seventh heard:\n%s", flags, out)
		}
	}
}

// rowOf is the targets row of the note.
func rowOf(rows []map[string]string, note string) map[string]string {
	for _, r := range rows {
		if r["note"] == note {
			return r
		}
	}
	return nil
}

// hzOf is the note's target in a targets CSV.
func hzOf(t *testing.T, csv, note string) float64 {
	t.Helper()
	_, rows := readCSV(t, csv)
	hz, err := strconv.ParseFloat(rowOf(rows, note)["hz"], 64)
	if err != nil {
		t.Fatalf("%s's hz: %v\n%s", note, err, csv)
	}
	return hz
}

// --seventh is a musical flag now: a ratio it does not take is a usage
// error, one line, exit 2 (interface contract, bad values), on every
// command that has --chord, before anything sounds or is read; the one-line
// tuning names the seventh a declared chord is tuned to, and tuning --save
// keeps it out of the folder's file as it keeps --chord.
func TestChordSeventhFlagEverywhere(t *testing.T) {
	t.Parallel()
	for _, cmd := range [][]string{{"targets"}, {"keyboard"}, {"tuning"}, {"drone"}, {"demo"}, {"listen", "--plain"}, {"analyze", "x.wav"}} {
		code, _, stderr := runCLI(t, append(cmd, "--chord", "G 7", "--seventh", "3/2")...)
		checkError(t, code, 2, stderr)
	}
	code, out, stderr := runCLI(t, "tuning", "--chord", "G dominant seventh", "--seventh", "9/5")
	if code != 0 || !strings.Contains(out, "chord G 7 (seventh 9/5)") || !regexp.MustCompile(`(?m)^seventh +9/5 +flag`).MatchString(out) {
		t.Errorf("tuning with a G dominant seventh at 9/5: exit %d, %s\n%s", code, stderr, out)
	}
	dir, config := t.TempDir(), t.TempDir()
	code, _, stderr = inFolder(t, dir, config, "tuning", "--save", "--key", "D major", "--seventh", "9/5")
	checkError(t, code, 2, stderr)
	if _, err := os.Stat(filepath.Join(dir, "fifthline.toml")); err == nil {
		t.Errorf("tuning --save --seventh wrote a tuning file")
	}
}

// The chord table says which just its sevenths are read against, since the
// seventh's cents from just mean nothing without it (--seventh: 16/9
// unless chosen; common practice): a G dominant seventh of sox sawtooths
// at equal temperament's G3 B3 D4 F4 (ISO 16, A4 = 440 Hz), one a channel.
func TestTheChordTableNamesTheSeventhsJust(t *testing.T) {
	multi, _ := soxParts(t, [][]soxNote{
		{{195.9977, 0.1, 1.5, 0.1}}, {{246.9417, 0.1, 1.5, 0.1}}, {{293.6648, 0.1, 1.5, 0.1}}, {{349.2282, 0.1, 1.5, 0.1}},
	})
	for _, c := range []struct {
		args  []string
		title string
	}{
		{nil, "sevenths against 16/9"},
		{[]string{"--seventh", "7/4"}, "sevenths against 7/4"},
	} {
		args := append([]string{"analyze", "--players", "b,t,a,s", "--chords", "--format", "table"}, c.args...)
		code, out, stderr := runCLI(t, append(args, multi)...)
		title, _, _ := strings.Cut(out, "\n")
		title, _, _ = strings.Cut(title, "   (") // where the tuning came from follows it
		if code != 0 || !strings.HasSuffix(title, " · "+c.title) || !strings.Contains(out, "G dominant seventh  seventh") {
			t.Errorf("%v: exit %d, stderr %q, out:\n%s", c.args, code, stderr, out)
		}
	}
}
