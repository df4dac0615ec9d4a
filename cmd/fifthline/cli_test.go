package main

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// runCLI runs the command in-process, as main would, and returns its exit
// code and streams.
func runCLI(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errb bytes.Buffer
	code = run(&env{ctx: context.Background(), stdin: strings.NewReader(""), stdout: &out, stderr: &errb}, args)
	return code, out.String(), errb.String()
}

// readCSV parses CSV output into header-keyed rows.
func readCSV(t testing.TB, text string) (header []string, rows []map[string]string) {
	t.Helper()
	recs, err := csv.NewReader(strings.NewReader(text)).ReadAll()
	if err != nil || len(recs) == 0 {
		t.Fatalf("not CSV (%v):\n%s", err, text)
	}
	for _, r := range recs[1:] {
		m := map[string]string{}
		for i, k := range recs[0] {
			m[k] = r[i]
		}
		rows = append(rows, m)
	}
	return recs[0], rows
}

// column is one column of the rows, in their order.
func column(rows []map[string]string, name string) []string {
	var col []string
	for _, r := range rows {
		col = append(col, r[name])
	}
	return col
}

// readCSVFile reads a CSV file (a journal) into header-keyed rows; it
// gives the text too, for messages.
func readCSVFile(t testing.TB, path string) (text string, rows []map[string]string) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	_, rows = readCSV(t, string(data))
	return string(data), rows
}

// sox makes a WAV file from sox arguments (Debian's sox is the reference
// signal generator; make test installs it).
func sox(t *testing.T, name string, args ...string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	cmd := exec.Command("sox", append(append([]string{"-n"}, args[:len(args)-1]...), append([]string{path}, strings.Fields(args[len(args)-1])...)...)...)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("sox %v: %v\n%s", args, err, out)
	}
	return path
}

// Errors are one line starting "fifthline: "; usage errors exit 2, others 1
// (interface contract).
func checkError(t *testing.T, code, want int, stderr string) {
	t.Helper()
	if code != want {
		t.Errorf("exit %d, want %d (stderr %q)", code, want, stderr)
	}
	lines := strings.Split(strings.TrimRight(stderr, "\n"), "\n")
	if len(lines) != 1 || !strings.HasPrefix(lines[0], "fifthline: ") {
		t.Errorf("stderr is not one line starting 'fifthline: ': %q", stderr)
	}
}

func TestUsageErrorsFromTheContract(t *testing.T) {
	for _, args := range [][]string{
		{"targets", "--key", "H"},
		{"targets", "--temperament", "meantone:1/0"},
		{"targets", "--temperament", "edo:0"},
		{"targets", "--temperament", "fifth:2000"},
		{"targets", "--a4", "-440"},
		{"targets", "--a4", "abc"},
		{"targets", "--temperament", "nosuch"},
		{"targets", "--format", "xml"},
		{"targets", "--bogus"},
		{"analyze"},
		{"analyze", "--key", "H", "x.wav"},
		{"nosuchcommand"},
	} {
		code, _, stderr := runCLI(t, args...)
		checkError(t, code, 2, stderr)
	}
}

func TestMalformedTemperamentFileIsAUsageErrorNamingTheLine(t *testing.T) {
	path := filepath.Join(t.TempDir(), "bad.tmp")
	os.WriteFile(path, []byte("C = 0\nQ# = 100\n"), 0o644)
	code, _, stderr := runCLI(t, "targets", "--temperament", path)
	checkError(t, code, 2, stderr)
	if !strings.Contains(stderr, "line 2") {
		t.Errorf("stderr %q does not name line 2", stderr)
	}
}

// targets CSV: the contract's header (note,hz and the recommended
// cents_from_equal,fifths) and the twelve window notes of the key.
func TestTargetsCSV(t *testing.T) {
	code, out, stderr := runCLI(t, "targets", "--key", "G major", "--temperament", "meantone:1/4", "--a4", "415", "--format", "csv")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	if strings.Join(header[:4], ",") != "note,hz,cents_from_equal,fifths" {
		t.Errorf("header %v", header)
	}
	// G major's window (contract): Bb … D#.
	if got := strings.Join(column(rows, "note"), " "); got != "Bb4 F4 C4 G4 D4 A4 E4 B4 F#4 C#4 G#4 D#4" {
		t.Errorf("notes %s", got)
	}
	if rows[5]["hz"] != "415.0000" { // A4 sits exactly at --a4 (contract)
		t.Errorf("A4 = %s Hz", rows[5]["hz"])
	}
}

func TestTargetsTableForEveryTemperament(t *testing.T) {
	for _, spec := range []string{"equal", "pythagorean", "meantone:1/4", "meantone:2/7", "fifth:697", "edo:31",
		"edo:53", "werckmeister3", "kirnberger3", "vallotti", "young", "just"} {
		code, out, stderr := runCLI(t, "targets", "--temperament", spec, "--key", "d minor")
		if code != 0 || strings.Count(out, "\n") != 14 {
			t.Errorf("%s: exit %d, %d lines, stderr %q\n%s", spec, code, strings.Count(out, "\n"), stderr, out)
		}
	}
}

// analyze reads sox tones at stated frequencies: in ¼-comma meantone at
// A4 = 415 Hz (C major), the G♭4 target is read as F♯4 41.06 ¢ sharp, sitting
// on G♭4 (lesser diesis 128/125, Barbour 1951).
func TestAnalyzeReadsSpelledNotesFromSoxTones(t *testing.T) {
	// ¼-comma targets at A4 = 415, from the definition (every fifth 5^(1/4)):
	// F#4 = 415·5^(3/4)/4 = 346.909 Hz, Gb4 = 415·32/5^(9/4) = 355.2349 Hz.
	a := sox(t, "fsharp.wav", "-r", "48000", "-b", "24", "synth 1.5 sine 346.909 gain -6")
	b := sox(t, "gflat.wav", "-r", "44100", "-b", "16", "synth 1.5 sine 355.2349 gain -6")
	code, out, stderr := runCLI(t, "analyze", "--temperament", "meantone:1/4", "--a4", "415", a, b)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	want := "file,start_s,end_s,note,hz,target_hz,cents,alt_note,alt_cents"
	if strings.Join(header[:9], ",") != want {
		t.Fatalf("header %v, want it to start %s", header, want)
	}
	if len(rows) != 2 {
		t.Fatalf("%d notes, want 2:\n%s", len(rows), out)
	}
	for i, w := range []struct{ note, alt, cents, altCents string }{
		{"F#4", "Gb4", "0.00", "-41.06"},
		{"F#4", "Gb4", "41.06", "0.00"},
	} {
		r := rows[i]
		if r["note"] != w.note || r["alt_note"] != w.alt || !closeTo(r["cents"], w.cents, 0.05) || !closeTo(r["alt_cents"], w.altCents, 0.05) {
			t.Errorf("row %d: %v, want %+v", i, r, w)
		}
	}
}

func closeTo(got, want string, tol float64) bool {
	var g, w float64
	if _, err := fmt.Sscan(got, &g); err != nil {
		return false
	}
	fmt.Sscan(want, &w)
	return g-w <= tol && w-g <= tol
}

func TestAnalyzeBadFilesAreOneLineErrors(t *testing.T) {
	dir := t.TempDir()
	empty := filepath.Join(dir, "empty.wav")
	os.WriteFile(empty, nil, 0o644)
	text := filepath.Join(dir, "notes.wav")
	os.WriteFile(text, []byte("this is not a WAV file at all, just words\n"), 0o644)
	for _, path := range []string{filepath.Join(dir, "missing.wav"), dir, empty, text} {
		code, stdout, stderr := runCLI(t, "analyze", path)
		checkError(t, code, 1, stderr)
		if stdout != "" {
			t.Errorf("analyze %s failed but printed %q", path, stdout)
		}
	}
}
