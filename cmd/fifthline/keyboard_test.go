package main

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fifthline/mts"
	"fifthline/target"
)

// equalHz is MIDI key k in equal temperament at A4 = 440 Hz, the frame of
// the MIDI Tuning Standard (key 69 = A4; ISO 16 for 440 Hz).
func equalHz(k int) float64 { return 440 * math.Exp2(float64(k-69)/12) }

// targetsByKey runs `fifthline targets` for octaves 0–8 and lays its notes on
// MIDI keys (key 60 = C4, the octave number belonging to the letter, so B♯3
// is key 60: common practice and the contract). Keys of octaves −1 and 9,
// which targets does not list, are the octave above or below (every
// temperament here repeats at the octave: common practice).
func targetsByKey(t *testing.T, musical ...string) (hz [128]float64, spelled [128]string) {
	t.Helper()
	for o := 0; o <= 8; o++ {
		code, out, stderr := runCLI(t, append([]string{"targets", "--format", "csv", "--octave", strconv.Itoa(o)}, musical...)...)
		if code != 0 {
			t.Fatalf("targets: %s", stderr)
		}
		_, rows := readCSV(t, out)
		for _, r := range rows {
			n, err := target.ParseNote(r["note"])
			if err != nil {
				t.Fatal(err)
			}
			f, _ := strconv.ParseFloat(r["hz"], 64)
			if k := 60 + n.Semitones(); k >= 0 && k < 128 {
				hz[k], spelled[k] = f, n.String()
			}
		}
	}
	for k := 115; k >= 0; k-- { // the octaves below what targets lists
		if hz[k] == 0 {
			hz[k] = hz[k+12] / 2
		}
	}
	for k := 12; k < 128; k++ { // and above
		if hz[k] == 0 {
			hz[k] = hz[k-12] * 2
		}
	}
	return hz, spelled
}

// writeKeyboard runs the command and returns the written file.
func writeKeyboard(t *testing.T, name string, args ...string) []byte {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if code, _, stderr := runCLI(t, append([]string{"keyboard", "--output", path}, args...)...); code != 0 {
		t.Fatalf("keyboard %v: exit %d: %s", args, code, stderr)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return data
}

// decodeAll splits a .syx file into messages and decodes each by the
// standard's layout.
func decodeAll(t *testing.T, syx []byte) []mts.Message {
	t.Helper()
	raw, err := mts.Split(syx)
	if err != nil {
		t.Fatal(err)
	}
	var out []mts.Message
	for _, r := range raw {
		m, err := mts.Decode(r)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, m)
	}
	return out
}

var keyboardTunings = [][]string{
	{"--temperament", "equal"},
	{"--key", "G major", "--temperament", "meantone:1/4", "--a4", "415"},
	{"--key", "C# major", "--temperament", "pythagorean"}, // B♯ and E♯ on the white keys
	{"--key", "Eb major", "--temperament", "werckmeister3", "--a4", "430"},
	{"--key", "D major", "--temperament", "just", "--anchor", "tonic"},
	{"--key", "F major", "--temperament", "edo:31", "--a4", "392"},
}

// Each key's word, read back by the standard's layout, is where `fifthline
// targets` puts the key's spelling, within 0.01 ¢ (the word's resolution is
// 0.0061 ¢; targets prints hertz to 4 decimals). Keys whose targets lie
// below 8.1758 Hz sit at 00 00 00 (MTS: the range ends there).
func TestKeyboardWordsAreTheTargets(t *testing.T) {
	for _, musical := range keyboardTunings {
		want, _ := targetsByKey(t, musical...)
		for _, form := range []string{"notes", "bulk"} {
			got := map[int]mts.Word{}
			msgs := decodeAll(t, writeKeyboard(t, "k.syx", append([]string{"--mts", form}, musical...)...))
			for _, m := range msgs {
				for _, k := range m.Keys {
					got[k.Key] = k.Word
				}
			}
			if len(got) != 128 {
				t.Fatalf("%v %s: %d keys", musical, form, len(got))
			}
			for k := 0; k < 128; k++ {
				if want[k] < mts.Word(0).Hz() {
					if got[k] != 0 {
						t.Errorf("%v %s key %d: target %.4f Hz below the range, word % X", musical, form, k, want[k], got[k].Bytes())
					}
					continue
				}
				if e := 1200 * math.Log2(got[k].Hz()/want[k]); math.Abs(e) > 0.01 {
					t.Errorf("%v %s key %d: word %.4f Hz, targets %.4f Hz (%+.4f ¢)", musical, form, k, got[k].Hz(), want[k], e)
				}
			}
		}
	}
}

// The 2-byte scale/octave form carries each pitch class's offset from equal
// temperament at A4 = 440 Hz (MTS scale/octave extension); read back, it is
// the targets' offset within 0.01 ¢ (its step is 0.0122 ¢).
func TestKeyboardOctaveFormCarriesTheTargetsOffsets(t *testing.T) {
	for _, musical := range [][]string{
		{"--temperament", "meantone:1/4"},
		{"--key", "Bb major", "--temperament", "vallotti", "--a4", "442"},
		{"--key", "A major", "--temperament", "meantone:1/6", "--a4", "435"},
	} {
		want, _ := targetsByKey(t, musical...)
		msgs := decodeAll(t, writeKeyboard(t, "k.syx", append([]string{"--mts", "octave"}, musical...)...))
		if len(msgs) != 1 || msgs[0].Kind != mts.KindScaleOctave || msgs[0].Channels != 0xFFFF {
			t.Fatalf("%v: want one scale/octave message for all 16 channels, got %+v", musical, msgs)
		}
		for pc, got := range msgs[0].Offsets {
			k := 60 + pc
			if off := 1200 * math.Log2(want[k]/equalHz(k)); math.Abs(got-off) > 0.01 {
				t.Errorf("%v pitch class %d: offset %+.4f ¢, targets %+.4f ¢", musical, pc, got, off)
			}
		}
	}
}

// Each key plays its pitch class's spelling from the key's window, as
// `targets` lists it; the contract's windows: G major runs B♭ … D♯, C♯
// major puts B♯3 on key 60 (the octave belongs to the letter).
func TestKeyboardTableNamesEachKeysSpelling(t *testing.T) {
	for _, c := range []struct {
		musical []string
		checks  map[int]string // from the contract's spelling window
	}{
		{[]string{"--key", "G major", "--temperament", "meantone:1/4", "--a4", "415"}, map[int]string{63: "D#4", 70: "Bb4", 66: "F#4"}},
		{[]string{"--key", "C major", "--temperament", "meantone:1/4"}, map[int]string{63: "Eb4", 68: "G#4", 61: "C#4"}},
		{[]string{"--key", "C# major", "--temperament", "pythagorean"}, map[int]string{60: "B#3", 65: "E#4"}},
	} {
		_, spelled := targetsByKey(t, c.musical...)
		path := filepath.Join(t.TempDir(), "k.mid")
		code, out, stderr := runCLI(t, append([]string{"keyboard", "--format", "csv", "--output", path}, c.musical...)...)
		if code != 0 {
			t.Fatalf("%v: %s", c.musical, stderr)
		}
		_, rows := readCSV(t, out)
		if len(rows) != 12 {
			t.Fatalf("%v: %d rows, want 12", c.musical, len(rows))
		}
		for _, r := range rows {
			k, _ := strconv.Atoi(r["key"])
			if r["note"] != spelled[k] {
				t.Errorf("%v key %d plays %s, targets spells %s", c.musical, k, r["note"], spelled[k])
			}
			if want, ok := c.checks[k]; ok && r["note"] != want {
				t.Errorf("%v key %d plays %s, the contract's window %s", c.musical, k, r["note"], want)
			}
		}
	}
}

// Without --format the table goes to stderr, beside the file; with --format
// table to stdout; with --format and no --output, the table alone
// (docs/interface.md, "Additions of this repository").
func TestKeyboardTableGoesToStderrUnlessAsked(t *testing.T) {
	path := filepath.Join(t.TempDir(), "organ.syx")
	musical := []string{"--key", "G major", "--temperament", "meantone:1/4", "--a4", "415"}
	code, out, stderr := runCLI(t, append([]string{"keyboard", "--output", path}, musical...)...)
	if code != 0 || out != "" || !strings.Contains(stderr, "D#4") || !strings.Contains(stderr, "\nfifthline: wrote "+path) {
		// The line saying what was written is a message like the others,
		// so it begins "fifthline: " as they do (as tuning --save's).
		t.Errorf("exit %d, stdout %q, stderr:\n%s", code, out, stderr)
	}
	code, out, stderr = runCLI(t, append([]string{"keyboard", "--format", "table", "--output", path}, musical...)...)
	if code != 0 || !strings.Contains(out, "D#4") || strings.Contains(stderr, "D#4") {
		t.Errorf("--format table: exit %d, stdout:\n%s\nstderr:\n%s", code, out, stderr)
	}
	// --format without --output: the table alone, no file written.
	os.Remove(path)
	code, out, stderr = runCLI(t, append([]string{"keyboard", "--format", "csv"}, musical...)...)
	if _, err := os.Stat(path); code != 0 || !strings.Contains(out, ",D#4,") || strings.Contains(stderr, "wrote") || err == nil {
		t.Errorf("--format csv alone: exit %d, stdout:\n%s\nstderr:\n%s", code, out, stderr)
	}
}

// The .mid is a format-0 Standard MIDI File that sends the same messages as
// the .syx at time 0, then selects tuning bank 0, program 0 on all 16
// channels (registered parameters 4 and 3); the scale/octave form needs no
// program, as it tunes the channels it names.
func TestKeyboardMIDIFileSendsAndSelects(t *testing.T) {
	musical := []string{"--key", "G major", "--temperament", "meantone:1/4", "--a4", "415"}
	for _, form := range []string{"notes", "bulk", "octave"} {
		if form == "octave" {
			musical = []string{"--temperament", "meantone:1/4"}
		}
		args := append([]string{"--mts", form}, musical...)
		syx, mid := writeKeyboard(t, "k.syx", args...), writeKeyboard(t, "k.mid", args...)
		raw, _ := mts.Split(syx)
		events, err := mts.ReadFile(mid)
		if err != nil {
			t.Fatalf("%s: %v", form, err)
		}
		selects := 0
		for i, e := range events {
			if e.Tick != 0 {
				t.Errorf("%s: event %d at tick %d", form, i, e.Tick)
			}
			if i < len(raw) && !bytes.Equal(e.Msg, raw[i]) {
				t.Errorf("%s: event %d is not the .syx's message %d", form, i, i)
			}
			if len(e.Msg) == 3 && e.Msg[0]&0xF0 == 0xB0 && e.Msg[1] == 100 && e.Msg[2] == 3 {
				selects++
			}
		}
		if want := map[bool]int{true: 0, false: 16}[form == "octave"]; selects != want {
			t.Errorf("%s: tuning program selected on %d channels, want %d", form, selects, want)
		}
	}
}

func TestKeyboardBadInput(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		args []string
		code int
		says string
	}{
		{[]string{"--mts", "sysex", "--output", filepath.Join(dir, "a.syx")}, 2, "--mts"},
		{[]string{"--output", filepath.Join(dir, "a.wav")}, 2, ".syx or .mid"},
		// Nothing asked: say both ways out, the file or the table alone
		// (docs/interface.md, "Additions": keyboard --format without --output).
		{[]string{}, 2, "keyboard needs --output FILE.syx or FILE.mid (or --format table"},
		{[]string{"--output", filepath.Join(dir, "a.mid"), "extra.mid"}, 2, "no file arguments"},
		{[]string{"--format", "json", "--output", filepath.Join(dir, "a.mid")}, 2, "--format"},
		{[]string{"--key", "H", "--output", filepath.Join(dir, "a.mid")}, 2, "--key"},
		{[]string{"--transpose", "Bb", "--output", filepath.Join(dir, "a.mid")}, 2, "--transpose"},
		{[]string{"--output", filepath.Join(dir, "no", "such", "dir", "a.mid")}, 1, "cannot write"},
		{[]string{"--output", dir + "/"}, 2, ".syx or .mid"},
		// A4 = 415 Hz lies 101.3 ¢ below 440: beyond the octave form's ±100 ¢.
		{[]string{"--mts", "octave", "--a4", "415", "--output", filepath.Join(dir, "a.syx")}, 2, "use --mts notes or bulk"},
	} {
		code, _, stderr := runCLI(t, append([]string{"keyboard"}, c.args...)...)
		checkError(t, code, c.code, stderr)
		if !strings.Contains(stderr, c.says) {
			t.Errorf("%v: %q does not say %q", c.args, stderr, c.says)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "a.syx")); err == nil {
		t.Error("a refused command wrote its file")
	}
}
