package main

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// chordRoleTake is four-part writing of our own, four major chords (C, F,
// G, C), each struck together and held 1.2 s: the cello on the root, the
// viola a fifth tuned 2 ¢ narrow of 3/2, the second violin a third 6 ¢
// above 5/4, the first violin the root two octaves up, pure. Just ratios
// (5/4, 3/2, 4/1) are common practice; the roots are equal-tempered at
// A4 = 440 Hz (ISO 16, 440·2^(n/12)); a detuning of c cents multiplies by
// 2^(c/1200) (the definition of the cent).
func chordRoleTake(t *testing.T) (multi, mono string) {
	const fifthCents, thirdCents = -2.0, 6.0
	roots := []float64{130.8128, 174.6141, 97.9989, 130.8128} // C3 F3 G2 C3
	parts := make([][]soxNote, 4)
	for i, r := range roots {
		before := 0.3
		if i == 0 {
			before = 0.2
		}
		for p, hz := range []float64{r, r * 1.5 * math.Exp2(fifthCents/1200), r * 2.5 * math.Exp2(thirdCents/1200), r * 4} {
			parts[p] = append(parts[p], soxNote{hz, before, 1.2, 0})
		}
	}
	for p := range parts {
		parts[p][len(parts[p])-1].after = 0.3
	}
	return soxParts(t, parts)
}

// roleOf finds a group's chord role in report --format json; who "any"
// pools the role over all groups (its count summed, its mean weighted by
// count, the words of the group with most chords).
func roleOf(t *testing.T, out, who, member string) (count int, mean float64, words string) {
	t.Helper()
	var rep struct {
		Groups []struct {
			Player, Voice string
			Roles         []struct {
				Quality string  `json:"chord_quality"`
				Member  string  `json:"member"`
				Count   int     `json:"count"`
				Mean    float64 `json:"mean_just_cents"`
				Words   string  `json:"words"`
			} `json:"chord_roles"`
		}
	}
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatalf("report JSON: %v\n%s", err, out)
	}
	most := 0
	for _, g := range rep.Groups {
		if who != "any" && g.Player != who && "voice "+g.Voice != who {
			continue
		}
		for _, r := range g.Roles {
			if r.Quality == "major" && r.Member == member {
				mean = (mean*float64(count) + r.Mean*float64(r.Count)) / float64(count+r.Count)
				count += r.Count
				if r.Count > most {
					most, words = r.Count, r.Words
				}
			}
		}
	}
	if count == 0 {
		t.Fatalf("no %s of major chords for %s in\n%s", member, who, out)
	}
	return count, mean, words
}

// analyze --chords --log, then report: each player's role in the chords
// is where it was played, within 1 ¢, and said in words (a third above
// just is sharp; a fifth whose upper note is flat of 3/2 is narrow).
func TestReportSaysWhereEachPlayerSitsInTheChords(t *testing.T) {
	t.Parallel()
	multi, mono := chordRoleTake(t)
	for _, c := range []struct {
		how                 []string
		fifth, third, octav string // who plays each role
	}{
		{[]string{"--players", "vc,vla,vl2,vl1", multi}, "vla", "vl2", "vl1"},
		// Two octaves above the root lies on the root's fourth partial: one
		// microphone cannot part them (the voices' doubled column), so the
		// mixture's chords are three voices.
		{[]string{"--voices", "4", mono}, "voice 2", "voice 3", ""},
	} {
		log := filepath.Join(t.TempDir(), "rehearsal.csv")
		code, out, stderr := runLong(t, append([]string{"analyze", "--chords", "--log", log, "--recorded", "2026-11-24 19:30"}, c.how...)...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", c.how[0], code, stderr)
		}
		t.Logf("%s:\n%s", c.how[0], out)
		code, rep, stderr := runCLI(t, "report", "--format", "json", log)
		if code != 0 {
			t.Fatalf("report: exit %d: %s", code, stderr)
		}
		// Logged when the take was played (--recorded), voices as players.
		if !strings.Contains(rep, `"rehearsal_dates": [
        "2026-11-24"
      ]`) {
			t.Errorf("%s: the journal's notes not dated 2026-11-24:\n%s", c.how[0], rep)
		}
		for _, w := range []struct {
			who, member string
			cents       float64
			words       string
		}{
			{c.fifth, "fifth", -2, "2.0 ¢ narrow"},
			{c.third, "third", 6, "6.0 ¢ above just (sharp)"},
			{c.octav, "root", 0, "pure"},
		} {
			if w.who == "" {
				continue
			}
			n, mean, words := roleOf(t, rep, w.who, w.member)
			if n != 4 || math.Abs(mean-w.cents) > 1 || words != w.words {
				t.Errorf("%s: %s's %ss: %d chords, %+.2f ¢ from just, %q; played 4, %+.0f ¢, want %q",
					c.how[0], w.who, w.member, n, mean, words, w.cents, w.words)
			}
		}
		_, table, _ := runCLI(t, "report", log)
		t.Logf("%s report:\n%s", c.how[0], table)
		if !strings.Contains(table, c.third+": ") {
			t.Errorf("%s: no line of words for %s in\n%s", c.how[0], c.third, table)
		}
	}
}

// listen --plain --voices --chords --log hears a chord live through a
// private virtual microphone (PulseAudio null sink, PortAudio input) and,
// when stopped, has written each voice's note with its voice and then the
// chord's memberships: report finds the third where sox put it, 6 ¢ above
// 5/4 above C4 (261.63 Hz; 5/4 and the cent: common practice).
func TestListenLogsTheChordsItHeard(t *testing.T) {
	t.Parallel()
	_, env, play := privateMic(t)
	c4 := 261.63
	third := strconv.FormatFloat(c4*5/4*math.Exp2(6.0/1200), 'f', 4, 64)
	wav := sox(t, "chord.wav", "-r", "48000", "-b", "16", "synth 2 sawtooth 261.63 sawtooth "+third+" sawtooth 392.445 remix 1,2,3 gain -8 pad 0.5 1")
	log := filepath.Join(t.TempDir(), "live.csv")
	wait, proc := startPlainProcess(t, env, "--voices", "auto", "--chords", "--log", log, "--duration", "60s")
	play(wav)
	stopPlain(t, proc, wait)
	journal, rows := readCSVFile(t, log)
	voices, members := 0, 0
	for _, r := range rows {
		if r["heard_chord"] == "" && r["voice"] != "" {
			voices++
		}
		if r["heard_chord"] == "C major" {
			members++
		}
	}
	if voices != 3 || members != 3 {
		t.Fatalf("%d voice notes and %d memberships, want 3 and 3:\n%s", voices, members, journal)
	}
	code, rep, stderr := runCLI(t, "report", "--format", "json", log)
	if code != 0 {
		t.Fatalf("report: exit %d: %s", code, stderr)
	}
	if n, mean, _ := roleOf(t, rep, "voice 2", "third"); n != 1 || math.Abs(mean-6) > 1 {
		t.Errorf("the third: %d chords, %+.2f ¢ from just; played 1, +6", n, mean)
	}
}
