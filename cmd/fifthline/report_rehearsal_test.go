package main

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// quarterCommaFifth is the pure fifth 3/2 narrowed by a quarter of the
// syntonic comma 81/80, in cents (the definition of ¼-comma meantone).
var quarterCommaFifth = 1200*math.Log2(1.5) - 1200*math.Log2(81.0/80)/4

// meantoneHz is the ¼-comma target fifths fifths away from A4 = 415 Hz,
// brought into the octave by octaves: F♯4 is three fifths up less two
// octaves, G♭4 nine fifths down and five octaves up.
func meantoneHz(fifths, octaves int) float64 {
	return 415 * math.Exp2((float64(fifths)*quarterCommaFifth+1200*float64(octaves))/1200)
}

// tone is a sox sine at cents from hz, 1.5 s, written as a WAV.
func tone(t *testing.T, name string, hz, cents float64) string {
	f := hz * math.Exp2(cents/1200) // the definition of the cent (common practice)
	return sox(t, name, "-r", "44100", "-b", "16", "synth 1.5 sine "+strconv.FormatFloat(f, 'f', 6, 64)+" vol 0.5")
}

// tableRow reports whether a line of the table matches the pattern.
func tableRow(table, pattern string) bool {
	return regexp.MustCompile(`(?m)^` + pattern).MatchString(table)
}

// rehearse analyses the takes into a journal and dates its lines to day,
// as if played then: analyze stamps a take with the time it was analysed
// unless the recording says when it was made.
func rehearse(t *testing.T, journalPath, day string, takes ...string) {
	t.Helper()
	args := append([]string{"analyze", "--key", "G major", "--temperament", "meantone:1/4", "--a4", "415",
		"--player", "tenor", "--log", journalPath}, takes...)
	if code, _, stderr := runCLI(t, args...); code != 0 {
		t.Fatalf("analyze: %d %s", code, stderr)
	}
	data, err := os.ReadFile(journalPath)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(data), "\n")
	for i := 1; i < len(lines); i++ {
		if len(lines[i]) > 10 {
			lines[i] = day + lines[i][10:]
		}
	}
	os.WriteFile(journalPath, []byte(strings.Join(lines, "\n")), 0o644)
}

// Two rehearsals a week apart, in ¼-comma meantone G major at A4 = 415 Hz,
// from sox tones at known pitches. In the first the tenor's F♯4s sit 6 and
// 8 ¢ high and one F♯ is played right on G♭4 (41.06 ¢ higher, the lesser
// diesis); in the second the F♯4s sit 1 and 3 ¢ high.
func TestReportByRehearsalOfSoxTones(t *testing.T) {
	if _, err := exec.LookPath("sox"); err != nil {
		t.Skip("sox not installed")
	}
	fSharp4, gFlat4 := meantoneHz(3, -2), meantoneHz(-9, 5)
	dir := t.TempDir()
	week1, week2 := filepath.Join(dir, "week1.csv"), filepath.Join(dir, "week2.csv")
	rehearse(t, week1, "2026-03-10", tone(t, "a.wav", fSharp4, 6), tone(t, "b.wav", fSharp4, 8), tone(t, "c.wav", gFlat4, 1))
	rehearse(t, week2, "2026-03-17", tone(t, "d.wav", fSharp4, 1), tone(t, "e.wav", fSharp4, 3))

	code, out, stderr := runCLI(t, "report", "--by", "rehearsal", "--format", "csv", week1, week2)
	if code != 0 {
		t.Fatalf("report: %d %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	if !strings.Contains(strings.Join(header, ","), ",rehearsal,") {
		t.Errorf("header %v lacks rehearsal", header)
	}
	type want struct{ count, other, mean, otherMean, tendency, within string }
	// Hand-computed from the tones: week 1 F♯4 (6 + 8)/2 = 7 ¢, neither
	// within ±5 ¢; the G♭4 counted apart at its own +1 ¢, not averaged in
	// as +42 ¢. Week 2 (1 + 3)/2 = 2 ¢, both within.
	wants := map[string]want{
		"2026-03-10": {"2", "1", "7", "1", "sits 7 ¢ sharp", "0"},
		"2026-03-17": {"2", "0", "2", "", "in tune", "2"},
	}
	seen := 0
	for _, r := range rows {
		if r["level"] != "note" || r["note"] != "F#4" {
			continue
		}
		seen++
		w, ok := wants[r["rehearsal"]]
		if !ok || r["player"] != "tenor" || r["count"] != w.count || r["on_other_spelling"] != w.other ||
			!closeTo(r["mean_cents"], w.mean, 0.05) || r["tendency"] != w.tendency || r["within"] != w.within ||
			(w.other != "0" && (r["other_spelling"] != "Gb4" || !closeTo(r["other_spelling_mean_cents"], w.otherMean, 0.05))) {
			t.Errorf("F#4 on %s: %v", r["rehearsal"], r)
		}
	}
	if seen != 2 {
		t.Errorf("%d F#4 rows, want one per rehearsal:\n%s", seen, out)
	}

	// The table says the same, with the rehearsal beside each note.
	code, table, _ := runCLI(t, "report", "--by", "rehearsal", week1, week2)
	if code != 0 || !tableRow(table, `F#4\s+2026-03-10\s+2\s+\+7\.0\s`) || !tableRow(table, `F#4\s+2026-03-17\s+2\s+\+2\.0\s`) {
		t.Errorf("table:\n%s", table)
	}
	// The JSON carries the rehearsal on each note.
	code, js, _ := runCLI(t, "report", "--by", "rehearsal", "--format", "json", week1, week2)
	var got struct {
		ByRehearsal bool `json:"by_rehearsal"`
		Groups      []struct {
			Notes []struct {
				Label     string `json:"label"`
				Rehearsal string `json:"rehearsal"`
			} `json:"notes"`
		} `json:"groups"`
	}
	if err := json.Unmarshal([]byte(js), &got); code != 0 || err != nil || !got.ByRehearsal || len(got.Groups) != 1 ||
		len(got.Groups[0].Notes) != 2 || got.Groups[0].Notes[1].Rehearsal != "2026-03-17" {
		t.Errorf("json %v %+v", err, got)
	}
}
