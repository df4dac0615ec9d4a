package main

import (
	"regexp"
	"strings"
	"testing"
)

// analyze --voices --format table ends, as --players does, with the take's
// group-drift line (docs/interface.md, "Additions of this repository"): a
// just chord's thirds, 13.7 ¢ off equal temperament (386.31 − 400 ¢, from the
// definitions), are the chord's tuning, not the take's drift. sox's chord is
// C4, a just E4 (327.0375 = 261.63·5/4) and G4 (392.445 = 261.63·3/2).
func TestAnalyzeVoicesTableEndsWithTheGroupsDrift(t *testing.T) {
	t.Parallel()
	path := sox(t, "chord.wav", "-r", "44100", "-b", "16", "synth 2 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8")
	code, out, stderr := runCLI(t, "analyze", "--voices", "auto", "--format", "table", path)
	lines := strings.Split(strings.TrimRight(out, "\n"), "\n")
	if last := lines[len(lines)-1]; code != 0 || !strings.HasPrefix(last, path+": group drift ") || !strings.Contains(last, "thirds 0.0 ¢") {
		t.Errorf("exit %d (%s), last line %q, want the group's drift with thirds 0.0 ¢ from just:\n%s", code, stderr, last, out)
	}
	// The table heads its columns in words (as the one-voice table does:
	// "start", "Hz", "other spelling"); the CSV keeps the contract's names.
	if len(lines) < 2 || !regexp.MustCompile(`^start +end +note +Hz +target Hz +cents +other spelling `).MatchString(lines[1]) || strings.Contains(lines[1], "_") {
		t.Errorf("the table's head is not in words:\n%s", out)
	}
	code, out, _ = runCLI(t, "analyze", "--voices", "auto", "--format", "csv", path)
	if !strings.HasPrefix(out, "start_s,end_s,note,hz,target_hz,cents,alt_note,alt_cents,") {
		t.Errorf("the CSV's header is not the contract's:\n%s", out)
	}
	if code != 0 || strings.Contains(out, "group drift") {
		t.Errorf("the CSV carries no such line:\n%s", out)
	}
}

// analyze --format table ends with one line per take (docs/interface.md,
// "Additions of this repository"), a take without a held note too: sox's
// second of silence says so under its name, beside sox's A4 = 440 Hz sine.
func TestAnalyzeTableHasALineForEveryTake(t *testing.T) {
	silence := sox(t, "silence.wav", "-r", "48000", "-b", "16", "trim 0 1")
	a4 := sox(t, "a4.wav", "-r", "48000", "-b", "16", "synth 0.8 sine 440 pad 0.2 0.3")
	code, out, stderr := runCLI(t, "analyze", "--format", "table", silence, a4)
	if code != 0 || !strings.HasSuffix(out, "\n"+silence+": no held notes\n"+a4+": 1 of 1 note within ±5 ¢; 0 on the other spelling\n") {
		t.Errorf("exit %d (%s):\n%s", code, stderr, out)
	}
	code, out, _ = runCLI(t, "analyze", "--format", "table", silence)
	if code != 0 || out != silence+": no held notes\n" {
		t.Errorf("silence alone: exit %d:\n%s", code, out)
	}
}

// The --players and --voices tables write a reading's cents as the
// one-voice table does ("+7.9 ¢", the unit after a space: FormatCents),
// cents under a head naming the unit signed to a tenth, and the CSV keeps
// its numbers: an equal-tempered G dominant seventh of sox sawtooths (ISO
// 16, A4 = 440 Hz) reads its third 13.7 ¢ above 5/4 (common practice). A
// voice's doubling is "yes" or nothing in the table, true/false in the CSV.
func TestTheGroupTablesWriteCentsAsTheOneVoiceTable(t *testing.T) {
	multi, one := soxParts(t, [][]soxNote{
		{{195.9977, 0.1, 1.5, 0.1}}, {{246.9417, 0.1, 1.5, 0.1}}, {{293.6648, 0.1, 1.5, 0.1}}, {{349.2282, 0.1, 1.5, 0.1}},
	})
	code, out, stderr := runCLI(t, "analyze", "--players", "b,t,a,s", "--chords", "--format", "table", multi)
	if code != 0 || !regexp.MustCompile(`(?m)^\S+ +\S+ +G dominant seventh +third +B3 +[0-9.]+ +(0\.0|[−+-]0\.[0-9]) ¢ +\+13\.7 +t$`).MatchString(out) {
		t.Errorf("exit %d (%s), table:\n%s", code, stderr, out)
	}
	code, out, stderr = runCLI(t, "analyze", "--voices", "auto", "--chords", "--format", "table", one)
	if code != 0 || !strings.Contains(out, " doubled") || strings.Contains(out, "false") {
		t.Errorf("--voices table: exit %d (%s):\n%s", code, stderr, out)
	}
	_, out, _ = runCLI(t, "analyze", "--players", "b,t,a,s", "--chords", "--format", "csv", multi)
	if strings.Contains(out, "¢") || !strings.Contains(out, ",third,B3,") {
		t.Errorf("the CSV:\n%s", out)
	}
}
