package main

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"fifthline/tuningfile"
)

// inFolder runs the built command in dir, as a musician would in a
// rehearsal folder, with config as the user's configuration folder.
func inFolder(t *testing.T, dir, config string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	return runBinary(t, dir, []string{"XDG_CONFIG_HOME=" + config}, args...)
}

// runBinary runs the built command in dir ("": here) with env added to its
// environment.
func runBinary(t *testing.T, dir string, env []string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	cmd := exec.Command(fifthlineBinary(t), args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), env...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	err := cmd.Run()
	if ee, ok := err.(*exec.ExitError); ok {
		code = ee.ExitCode()
	} else if err != nil {
		t.Fatal(err)
	}
	return code, out.String(), errb.String()
}

// targetsRow is the row of a note in 'targets --format csv'.
func targetsRow(t *testing.T, out, note string) map[string]string {
	t.Helper()
	_, rows := readCSV(t, out)
	for _, r := range rows {
		if r["note"] == note {
			return r
		}
	}
	t.Fatalf("no %s in\n%s", note, out)
	return nil
}

// The contract's order: a flag, else ./fifthline.toml, else the user's
// fifthline.toml, else the default; the command says where each value came
// from when no flag set it.
func TestTheTuningInForce(t *testing.T) {
	dir, config := t.TempDir(), t.TempDir()

	// Nothing saved: the defaults (C major, equal, A4 = 440 Hz, ISO 16), and
	// the command says so.
	code, out, stderr := inFolder(t, dir, config, "targets", "--format", "csv")
	if code != 0 || targetsRow(t, out, "A4")["hz"] != "440.0000" || !strings.Contains(stderr, "key, temperament, a4 by default") {
		t.Errorf("defaults: exit %d, stderr %q", code, stderr)
	}

	// The user-wide file is the fallback.
	os.MkdirAll(filepath.Join(config, "fifthline"), 0o755)
	os.WriteFile(filepath.Join(config, "fifthline", "fifthline.toml"), []byte("a4 = 430\nkey = \"F major\"\n"), 0o644)
	code, out, stderr = inFolder(t, dir, config, "targets", "--format", "csv")
	if code != 0 || targetsRow(t, out, "A4")["hz"] != "430.0000" || !strings.Contains(stderr, "key, a4 from "+filepath.Join(config, "fifthline", "fifthline.toml")) {
		t.Errorf("user file: exit %d, stderr %q", code, stderr)
	}

	// The rehearsal folder's file wins over it, value by value.
	code, _, stderr = inFolder(t, dir, config, "tuning", "--save", "--key", "G major", "--temperament", "meantone:1/4")
	if code != 0 || !strings.Contains(stderr, "saved key, temperament to ./fifthline.toml") {
		t.Fatalf("tuning --save: exit %d, stderr %q", code, stderr)
	}
	code, out, stderr = inFolder(t, dir, config, "targets", "--format", "csv")
	// ¼-comma meantone at A4 = 430: F♯4 three fifths above A4, less two
	// octaves: 430·5^(3/4)/4 (definition: every fifth 5^(1/4)).
	fsharp := targetsRow(t, out, "F#4")
	if code != 0 || !closeTo(fsharp["hz"], fmt.Sprint(430*math.Pow(5, 0.75)/4), 0.0001) {
		t.Errorf("folder over user file: F#4 %v", fsharp)
	}
	if want := "key, temperament from ./fifthline.toml; a4 from "; !strings.Contains(stderr, want) {
		t.Errorf("stderr %q does not say %q", stderr, want)
	}

	// A flag wins over both, and is not mentioned.
	code, out, stderr = inFolder(t, dir, config, "targets", "--format", "csv", "--a4", "415", "--key", "G major")
	if code != 0 || targetsRow(t, out, "A4")["hz"] != "415.0000" || strings.Contains(stderr, "a4 from") || !strings.Contains(stderr, "temperament from ./fifthline.toml") {
		t.Errorf("flags: exit %d, stderr %q", code, stderr)
	}

	// The table carries the tuning and its origin in its header.
	_, out, _ = inFolder(t, dir, config, "targets")
	if first := strings.SplitN(out, "\n", 2)[0]; !strings.Contains(first, "G major · 1/4-comma meantone · A4 = 430 Hz") || !strings.Contains(first, "from ./fifthline.toml") {
		t.Errorf("table header %q", first)
	}

	// 'fifthline tuning' shows each value and where it came from.
	_, out, _ = inFolder(t, dir, config, "tuning", "--a4", "415")
	// No transposition reads as sounding pitch (against written pitch,
	// common practice), not "concert pitch", which beside A4 = 415 Hz
	// reads as a claim about the reference.
	for _, want := range []string{`key\s+G major\s+\./fifthline\.toml`, `a4\s+415\s+flag`, `anchor\s+a4\b.*\sdefault`, `transpose\s+none \(sounding pitch\)\s+default`} {
		if !regexp.MustCompile(`(?m)^` + want + `\s*$`).MatchString(out) {
			t.Errorf("tuning output lacks a line %s:\n%s", want, out)
		}
	}
	// Without --anchor the anchor row says the one in force: just keeps its
	// tonic where equal temperament puts it (interface contract, --a4), so
	// there it reads tonic, not "a4 (tonic in just)".
	_, out, _ = inFolder(t, dir, config, "tuning", "--temperament", "just")
	if !regexp.MustCompile(`(?m)^anchor\s+tonic \(just keeps its tonic\)\s+default\s*$`).MatchString(out) {
		t.Errorf("just's anchor row:\n%s", out)
	}
}

// --save writes only the flags given, over what the folder's file holds.
func TestSaveKeepsWhatItIsNotGiven(t *testing.T) {
	dir, config := t.TempDir(), t.TempDir()
	for _, args := range [][]string{
		{"tuning", "--save", "--a4", "415"},
		{"tuning", "--save", "--key", "d minor", "--transpose", "Bb"},
	} {
		if code, _, stderr := inFolder(t, dir, config, args...); code != 0 {
			t.Fatalf("%v: exit %d, %s", args, code, stderr)
		}
	}
	data, err := os.ReadFile(filepath.Join(dir, "fifthline.toml"))
	if err != nil {
		t.Fatal(err)
	}
	v, err := tuningfile.Parse("fifthline.toml", data, nil)
	if want := (tuningfile.Values{Key: "D minor", A4: "415", Transpose: "Bb"}); err != nil || v != want {
		t.Errorf("saved %+v (%v), want %+v:\n%s", v, err, want, data)
	}
	// Nothing to save, or a chord (it changes with the music): usage errors.
	for _, args := range [][]string{{"tuning", "--save"}, {"tuning", "--save", "--chord", "D major"}} {
		code, _, stderr := inFolder(t, dir, config, args...)
		checkError(t, code, 2, stderr)
	}
}

// A mistake in a fifthline.toml is a usage error naming the file and the
// line, in one line (contract: unreadable values are usage errors).
func TestABadTuningFileNamesItsLine(t *testing.T) {
	dir, config := t.TempDir(), t.TempDir()
	os.WriteFile(filepath.Join(dir, "fifthline.toml"), []byte("# ours\nkey = \"G major\"\na4 = -440\n"), 0o644)
	for _, cmd := range []string{"targets", "analyze", "tuning", "drone"} {
		code, stdout, stderr := inFolder(t, dir, config, cmd, "x.wav")
		if cmd == "targets" || cmd == "tuning" || cmd == "drone" {
			code, stdout, stderr = inFolder(t, dir, config, cmd)
		}
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, "./fifthline.toml line 3") || stdout != "" {
			t.Errorf("%s: stderr %q does not name ./fifthline.toml line 3 (stdout %q)", cmd, stderr, stdout)
		}
	}
}

// A temperament file named in a fifthline.toml is found beside it, from
// whichever folder the command runs.
func TestATemperamentFileBesideTheTuningFile(t *testing.T) {
	dir, config := t.TempDir(), t.TempDir()
	user := filepath.Join(config, "fifthline")
	os.MkdirAll(user, 0o755)
	// A regular temperament by its fifth: 700 ¢ is equal temperament
	// (definition), so A4 = 440 Hz and C4 = 261.6256 Hz (standard tables).
	os.WriteFile(filepath.Join(user, "organ.tmp"), []byte("fifth = 700\n"), 0o644)
	os.WriteFile(filepath.Join(user, "fifthline.toml"), []byte("temperament = \"organ.tmp\"\n"), 0o644)
	code, out, stderr := inFolder(t, dir, config, "targets", "--format", "csv")
	if code != 0 || !closeTo(targetsRow(t, out, "C4")["hz"], "261.6256", 0.0001) {
		t.Errorf("exit %d, stderr %q\n%s", code, stderr, out)
	}
}
