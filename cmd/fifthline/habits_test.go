package main

import (
	"math"
	"regexp"
	"strings"
	"testing"

	"fifthline/target"
)

// help COMMAND is COMMAND -h: a usage line that shows the arguments, then
// every flag with two dashes, as the README documents them.
func TestHelpForEachCommand(t *testing.T) {
	for _, c := range commandTable() {
		code, out, stderr := runCLI(t, "help", c.name)
		if code != 0 || stderr != "" {
			t.Errorf("help %s: exit %d, stderr %q", c.name, code, stderr)
		}
		if want := "usage: fifthline " + c.name + " [flags]"; !strings.HasPrefix(out, want) {
			t.Errorf("help %s starts %q, want %q", c.name, strings.SplitN(out, "\n", 2)[0], want)
		}
		if single := regexp.MustCompile(`(?m)^\s+-[a-z]`).FindString(out); single != "" {
			t.Errorf("help %s lists a flag with one dash: %q", c.name, single)
		}
		_, dashH, _ := runCLI(t, c.name, "-h")
		if dashH != out {
			t.Errorf("%s -h differs from help %s", c.name, c.name)
		}
	}
	for cmd, args := range map[string]string{"analyze": "FILE...", "report": "JOURNAL..."} {
		if _, out, _ := runCLI(t, "help", cmd); !strings.HasPrefix(out, "usage: fifthline "+cmd+" [flags] "+args+"\n") {
			t.Errorf("help %s: %q", cmd, strings.SplitN(out, "\n", 2)[0])
		}
	}
	// The flags the contract names appear as it writes them.
	_, out, _ := runCLI(t, "help", "analyze")
	for _, want := range []string{"--key", "--temperament SPEC", "--a4 HZ", "--format csv|table|json", "--frames", "--log FILE"} {
		if !strings.Contains(out, want) {
			t.Errorf("help analyze lacks %q", want)
		}
	}
	code, _, stderr := runCLI(t, "help", "nosuch")
	checkError(t, code, 2, stderr)
}

func TestVersion(t *testing.T) {
	code, out, _ := runCLI(t, "--version")
	if code != 0 || !strings.HasPrefix(out, "fifthline ") || strings.Count(out, "\n") != 1 {
		t.Errorf("exit %d, %q", code, out)
	}
}

// One name per idea: --level is the sound's level and --output its device
// in every command that sounds; the old names still work.
func TestOneNamePerIdeaAndTheOldNames(t *testing.T) {
	for _, cmd := range []string{"drone", "listen", "demo"} {
		_, out, _ := runCLI(t, "help", cmd)
		if !strings.Contains(out, "--level DBFS") || !strings.Contains(out, "--output ID") {
			t.Errorf("help %s lacks --level DBFS or --output ID:\n%s", cmd, out)
		}
	}
	_, out, _ := runCLI(t, "help", "listen")
	if !strings.Contains(out, "(also --drone-level)") {
		t.Errorf("help listen does not show the old name --drone-level")
	}
	// The old names reach the same check (contract: refuse above −6 dBFS).
	for _, args := range [][]string{
		{"drone", "--level", "-3"}, {"drone", "--device", "x", "--level", "0"},
		{"listen", "--drone-level", "-3"}, {"demo", "--level", "-1"},
	} {
		code, _, stderr := runCLI(t, args...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, "-6 dBFS limit") {
			t.Errorf("%v: %q", args, stderr)
		}
	}
}

// Help names what a flag takes as the contract writes it: "--by rehearsal"
// (report), "--format table|csv" (keyboard, whose --format may be left out).
func TestHelpNamesWhatFlagsTake(t *testing.T) {
	for cmd, want := range map[string]string{"report": "\n  --by rehearsal\n", "keyboard": "\n  --format table|csv\n", "drone": "\n  --output ID   (also --device)\n"} {
		if _, out, _ := runCLI(t, "help", cmd); !strings.Contains(out, want) {
			t.Errorf("help %s lacks %q:\n%s", cmd, want, out)
		}
	}
	// keyboard's --output is the contract's FILE.syx|FILE.mid, not a device.
	if _, out, _ := runCLI(t, "help", "keyboard"); !strings.Contains(out, "\n  --output FILE.syx|FILE.mid\n") {
		t.Errorf("help keyboard's --output:\n%s", out)
	}
}

// A flag the command lacks is a usage error in one line that names the
// flag it nearest spells, or where the flags are listed (the contract:
// one line, exit 2).
func TestAnUnknownFlagNamesTheNearestOne(t *testing.T) {
	for _, c := range []struct {
		args []string
		says string
	}{
		{[]string{"analyze", "--temperment", "just", "x.wav"}, "analyze: --temperment is not one of its flags (did you mean --temperament?)"},
		{[]string{"drone", "-nots", "G3"}, "drone: --nots is not one of its flags (did you mean --notes?)"},
		{[]string{"analyze", "--loud", "x.wav"}, "analyze: --loud is not one of its flags ('fifthline help analyze' lists them)"},
	} {
		code, _, stderr := runCLI(t, c.args...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, c.says) {
			t.Errorf("%v: %q does not say %q", c.args, stderr, c.says)
		}
	}
}

// --player with a list is --players missing its s (the contract's --players
// NAMES is a comma list; --player names the journal's one player): a usage
// error that says which, before anything is read.
func TestPlayerWithAListPointsToPlayers(t *testing.T) {
	for _, args := range [][]string{{"listen"}, {"analyze", "take.wav"}} {
		cmd := args[0]
		code, _, stderr := runCLI(t, append(args, "--player", "vc,vla")...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, "one player per channel is --players vc,vla") {
			t.Errorf("%s: %q", cmd, stderr)
		}
	}
}

// fifthline alone is a usage error, one line like every other (the
// contract), naming the commands and where the overview is.
func TestNoCommandIsOneLine(t *testing.T) {
	code, out, stderr := runCLI(t)
	checkError(t, code, 2, stderr)
	if out != "" || !strings.Contains(stderr, "targets, listen, demo") || !strings.Contains(stderr, "'fifthline help'") {
		t.Errorf("stdout %q, stderr %q", out, stderr)
	}
}

// A channel past the file's is the asker's slip, a usage error (exit 2) as
// --players naming one is, in one line saying how many the file has: sox's
// one-channel A4.
func TestAChannelPastTheFilesIsAUsageError(t *testing.T) {
	mono := sox(t, "a4.wav", "-r", "48000", "-b", "16", "synth 0.5 sine 440")
	code, _, stderr := runCLI(t, "analyze", "--channel", "3", mono)
	checkError(t, code, 2, stderr)
	if !strings.Contains(stderr, "channel 3 requested but the file has one channel") {
		t.Errorf("stderr %q", stderr)
	}
}

// A group's take of more than two channels read without --players or
// --channel is read on channel 1 (the contract: "mono or the first
// channel"), and analyze says so, naming the flags that read the others;
// --channel asked for, nothing is said. sox's three channels of A4.
func TestAMultichannelTakeReadOnOneChannelSaysSo(t *testing.T) {
	take := sox(t, "three.wav", "-r", "48000", "-b", "16", "-c", "3", "synth 0.5 sine 440")
	for _, args := range [][]string{{"analyze", take}, {"analyze", "--voices", "auto", take}} {
		code, _, stderr := runCLI(t, args...)
		if code != 0 || !strings.Contains(stderr, take+" has 3 channels; reading channel 1 (--channel N reads another, --players one player per channel)") {
			t.Errorf("%v: exit %d, stderr %q", args, code, stderr)
		}
	}
	if _, _, stderr := runCLI(t, "analyze", "--channel", "1", take); strings.Contains(stderr, "channels; reading") {
		t.Errorf("--channel given, still said: %q", stderr)
	}
}

// A choice flag refuses a word it does not know, listing the ones it does.
func TestChoiceFlagsListTheirWords(t *testing.T) {
	code, _, stderr := runCLI(t, "analyze", "--format", "xml", "x.wav")
	checkError(t, code, 2, stderr)
	if !strings.Contains(stderr, "--format") || !strings.Contains(stderr, "csv, table or json") {
		t.Errorf("stderr %q", stderr)
	}
	// keyboard's --format may be left out, which is no word to list.
	code, _, stderr = runCLI(t, "keyboard", "--format", "xml")
	checkError(t, code, 2, stderr)
	if !strings.Contains(stderr, "use table or csv") {
		t.Errorf("stderr %q", stderr)
	}
}

// The drone's caution says the level, the cap and the quiet start (hearing
// safety, the project's rule; the contract's −6 dBFS limit).
func TestDroneCautionSaysLevelCapAndFade(t *testing.T) {
	if got, want := droneCaution(-18), "fifthline: caution: "+hearingAdvice+"; peak level -18 dBFS (never above -6), fading in"; got != want {
		t.Errorf("got  %q\nwant %q", got, want)
	}
}

// drone without --notes sounds the tonic in octave 3 and the fifth above:
// in ¼-comma meantone at A4 = 440 Hz (ISO 16), G major gives G3 = 440/5^(1/2)
// and D4 = 440/5^(1/4) (every fifth 5^(1/4), by definition), the pair
// TestDroneSoundsTheTargetsAtTheLevel hears.
func TestDroneWithoutNotesSoundsTonicAndFifth(t *testing.T) {
	tu := gMajorQuarterComma(t)
	hz, names, err := droneTargets(tu, nil)
	if err != nil || names != "G3 D4" || len(hz) != 2 {
		t.Fatalf("%v %q %v", hz, names, err)
	}
	for i, want := range []float64{440 / math.Sqrt(5), 440 / math.Pow(5, 0.25)} {
		if math.Abs(hz[i]-want) > 1e-9 {
			t.Errorf("%s: %.6f Hz, want %.6f", strings.Fields(names)[i], hz[i], want)
		}
	}
}

// --notes takes the notes a player lists with spaces as with commas: "G3
// D4" in ¼-comma meantone at A4 = 440 Hz is the same G3 and D4 (the
// pair above, by the temperament's definition).
func TestDroneNotesBySpacesOrCommas(t *testing.T) {
	tu := gMajorQuarterComma(t)
	for _, list := range []string{"G3 D4", "G3, D4", " G3,D4 "} {
		hz, names, err := droneTargets(tu, &list)
		if err != nil || names != "G3 D4" || len(hz) != 2 || math.Abs(hz[1]-440/math.Pow(5, 0.25)) > 1e-9 {
			t.Errorf("--notes %q: %v %q %v", list, hz, names, err)
		}
	}
	for _, list := range []string{"", " , ", "G3 H4"} {
		if _, _, err := droneTargets(tu, &list); err == nil {
			t.Errorf("--notes %q accepted", list)
		}
	}
}

// gMajorQuarterComma is the drone's tuning as its flags give it: G major,
// ¼-comma meantone, A4 = 440 Hz.
func gMajorQuarterComma(t *testing.T) target.Tuning {
	t.Helper()
	fs := newFlags("drone")
	mf := addMusicalFlags(fs)
	if err := fs.Parse([]string{"--key", "G major", "--temperament", "meantone:1/4"}); err != nil {
		t.Fatal(err)
	}
	tu, err := mf.tuning()
	if err != nil {
		t.Fatal(err)
	}
	return tu
}
