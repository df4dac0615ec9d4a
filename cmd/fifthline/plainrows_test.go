package main

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// listen --plain --players writes each note as analyze writes it from the
// same take: a note sounding in a chord spelled from the chord's root (G♯4
// as the third of E major in F major, interface contract, "Spelling
// window"), the same pitch alone from the key (A♭4), in the note rows and
// in the journal. The parts are E3, B3, G♯4 and E4 at their ¼-comma
// meantone targets at A4 = 415 Hz (meantoneHz: the published definition
// from the fifth), then the G♯4 alone, through a four-channel null sink of the test's own. Its
// cents: 0 against G♯4's target; −41.06 ¢ against A♭4's, the lesser
// diesis 128/125 that ¼-comma meantone puts between them (its pure major
// thirds: common practice).
func TestListenPlainSpellsNotesFromTheirChordAsAnalyzeDoes(t *testing.T) {
	gs4 := meantoneHz(5, -3)
	multi, _ := soxParts(t, [][]soxNote{
		{{meantoneHz(1, -2), 0.2, 1.5, 1.6}},
		{{meantoneHz(2, -2), 0.2, 1.5, 1.6}},
		{{gs4, 0.2, 1.5, 0.2}, {gs4, 0.2, 1.0, 0.2}},
		{{meantoneHz(1, -1), 0.2, 1.5, 1.6}},
	})
	musical := []string{"--key", "F major", "--temperament", "meantone:1/4", "--a4", "415", "--players", "vc,vla,vl2,vl1"}
	code, out, stderr := runCLI(t, append(append([]string{"analyze"}, musical...), multi)...)
	if code != 0 {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	_, file := readCSV(t, out)
	journal := filepath.Join(t.TempDir(), "journal.csv")
	live := playQuartetLive(t, multi, append(musical, "--log", journal)...)
	_, rows := readCSV(t, live)
	if len(rows) != len(file) {
		t.Fatalf("%d rows live, %d from the file:\n%s\n%s", len(rows), len(file), live, out)
	}
	worst := 0.0
	for _, f := range file {
		var r map[string]string
		for _, l := range rows {
			if l["player"] == f["player"] && math.Abs(parseF(l["start_s"])-parseF(f["start_s"])) < 0.2 {
				r = l
			}
		}
		if r == nil || r["note"] != f["note"] || r["alt_note"] != f["alt_note"] || r["on_other_spelling"] != f["on_other_spelling"] {
			t.Errorf("%s's note at %s s: live %v, from the file %v", f["player"], f["start_s"], r, f)
			continue
		}
		// The sink carries the take's samples unchanged, so the cents agree
		// to the column's 0.01 ¢ (measured: 0.000 ¢ apart); each row's own
		// cents are exact against its spelling.
		worst = max(worst, math.Abs(parseF(r["cents"])-parseF(f["cents"])))
		if own := 1200 * math.Log2(parseF(r["hz"])/parseF(r["target_hz"])); math.Abs(own-parseF(r["cents"])) > 0.01 {
			t.Errorf("%s's %s: %s ¢ written, 1200·log2(hz/target_hz) = %.3f ¢", r["player"], r["note"], r["cents"], own)
		}
	}
	t.Logf("cents live against the file: at most %.3f ¢ apart", worst)
	if worst > 0.01 {
		t.Errorf("live cents up to %.3f ¢ from the file's", worst)
	}
	var third []string
	for _, r := range rows {
		if r["player"] == "vl2" {
			third = append(third, r["note"]+" "+r["cents"])
			want := map[string]float64{"G#4": 0, "Ab4": -41.06}[r["note"]]
			if math.Abs(parseF(r["cents"])-want) > 0.5 {
				t.Errorf("vl2's %s at %s ¢, want %+.2f ¢", r["note"], r["cents"], want)
			}
		}
	}
	if len(third) != 2 || !strings.HasPrefix(third[0], "G#4 ") || !strings.HasPrefix(third[1], "Ab4 ") {
		t.Errorf("vl2 live: %v, want G#4 (the third of E major) then Ab4 (alone)", third)
	}
	data, err := os.ReadFile(journal)
	if err != nil {
		t.Fatal(err)
	}
	_, logged := readCSV(t, string(data))
	var notes []string
	for _, r := range logged {
		if r["player"] == "vl2" {
			notes = append(notes, r["note"]+"@"+r["channel"])
		}
	}
	if strings.Join(notes, ",") != "G#4@3,Ab4@3" {
		t.Errorf("journal has vl2's %v, want G#4 then Ab4 on channel 3\n%s", notes, data)
	}
}
