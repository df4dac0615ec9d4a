package main

import (
	"math"
	"regexp"
	"strings"
	"testing"

	"fifthline/session"
	"fifthline/target"
)

// The --players and --voices note tables say the other spelling in the
// one-voice table's words (Reading.OtherWords), in one column, where the
// CSV keeps the contract's four columns. In ¼-comma meantone G♭4 lies
// 41.1 ¢ above F♯4 (the diesis, 128/125: common practice), so an F♯4
// played 36 ¢ sharp sits on G♭4 (the contract's quarter-gap rule); 3 ¢
// flat it is F♯4 with G♭4 44 ¢ away.
func TestTheGroupTablesSayTheOtherSpellingInWords(t *testing.T) {
	tu := gMajorQuarterComma(t)
	fSharp, err := target.ParseNote("F#4")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		cents float64
		words string
	}{
		{36, "sits on Gb4 (−5.1 ¢)"},
		{-3, "Gb4 would be −44.1 ¢"},
	} {
		r := tu.Classify(tu.Target(fSharp) * math.Exp2(c.cents/1200))
		head, rec := otherInWords(session.Header(false), session.Event{Reading: r}.Record(false))
		words := rec[indexOf(head, "alt_note")]
		if words != r.OtherWords() || strings.ReplaceAll(words, "-", "−") != c.words {
			t.Errorf("F#4 %+.0f ¢: %q, want %q as the one-voice table says it (%q)", c.cents, words, c.words, r.OtherWords())
		}
		for _, gone := range []string{"alt_cents", "on_other_spelling", "same_pitch"} {
			if indexOf(head, gone) >= 0 {
				t.Errorf("the table keeps the column %s: %v", gone, head)
			}
		}
	}
}

// The group tables' first line says where the tuning came from, as the
// one-voice table's does: here no flag or file set it (the defaults, C
// major, equal temperament, A4 = 440 Hz); their seconds and hertz are
// written to a hundredth, as that table writes them (the CSV keeps its
// places).
func TestTheGroupTablesTitleSaysWhereTheTuningCameFrom(t *testing.T) {
	t.Parallel()
	take := soxQuartet(t)
	for _, how := range [][]string{{"--players", "vc,vla,vl2,vl1"}, {"--players", "vc,vla,vl2,vl1", "--chords"}} {
		code, out, stderr := runCLI(t, append(append([]string{"analyze", "--format", "table"}, how...), take)...)
		title, _, _ := strings.Cut(out, "\n")
		if code != 0 || !strings.HasSuffix(title, "   (key, temperament, a4 by default)") {
			t.Errorf("%v: exit %d (%s), title %q", how, code, stderr, title)
		}
		if rows := strings.Split(out, "\n"); len(rows) < 3 || !regexp.MustCompile(`^\d+\.\d\d +\d+\.\d\d `).MatchString(rows[2]) || regexp.MustCompile(`\.\d{3}`).MatchString(rows[2]) {
			t.Errorf("%v: the first row does not write seconds and hertz to a hundredth:\n%s", how, out)
		}
	}
}

// A group's take read at the wrong reference warns as one player's does
// (docs/interface.md, "Additions": analyze names a key and reference that
// fit): soxQuartet's chords, tuned at A4 = 440 Hz (ISO 16), read with a
// forgotten --a4 415 lie a semitone off C major.
func TestAGroupsTakeInAnotherTuningWarns(t *testing.T) {
	t.Parallel()
	take := soxQuartet(t)
	for _, how := range [][]string{{"--players", "vc,vla,vl2,vl1"}, {"--players", "vc,vla,vl2,vl1", "--chords"}} {
		code, _, stderr := runCLI(t, append(append([]string{"analyze", "--key", "C major", "--a4", "415"}, how...), take)...)
		if code != 0 || !strings.Contains(stderr, "warning: "+take+": ") || !strings.Contains(stderr, "fit C major at A4 ≈ 440.0 Hz") {
			t.Errorf("%v: exit %d, stderr %q", how, code, stderr)
		}
		code, _, stderr = runCLI(t, append(append([]string{"analyze", "--key", "C major"}, how...), take)...)
		if code != 0 || strings.Contains(stderr, "warning") {
			t.Errorf("%v at the take's own A4 = 440 Hz: exit %d, stderr %q", how, code, stderr)
		}
	}
}
