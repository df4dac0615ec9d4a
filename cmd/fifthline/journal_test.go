package main

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// A full disk does not stop analyze: the notes still reach stdout, the
// journal's failure is said once as it happens and once at the end (exit 1).
func TestLogOnAFullDiskWarnsAndKeepsAnalysing(t *testing.T) {
	if _, err := exec.LookPath("sox"); err != nil {
		t.Skip("sox not installed")
	}
	if _, err := os.Stat("/dev/full"); err != nil {
		t.Skip("no /dev/full")
	}
	wav := sox(t, "a4.wav", "-r", "44100", "-b", "16", "synth 1 sine 440 vol 0.5")
	code, out, stderr := runCLI(t, "analyze", "--format", "csv", "--log", "/dev/full", wav)
	if _, rows := readCSV(t, out); len(rows) != 1 || rows[0]["note"] != "A4" {
		t.Errorf("analysis output %q", out)
	}
	lines := strings.Split(strings.TrimSpace(stderr), "\n")
	if code != 1 || len(lines) != 2 ||
		lines[0] != "fifthline: warning: journal: cannot write /dev/full: no space left on device — going on without it" ||
		lines[1] != "fifthline: journal: cannot write /dev/full: no space left on device (1 of 1 notes not logged)" {
		t.Errorf("exit %d, stderr:\n%s", code, stderr)
	}
}

func TestLogRefusesAFileThatIsNotAJournal(t *testing.T) {
	path := filepath.Join(t.TempDir(), "notes.txt")
	os.WriteFile(path, []byte("shopping: rosin, strings\n"), 0o644)
	jf := journalFlags{log: path}
	if _, err := jf.open(&env{}); err == nil || !strings.Contains(err.Error(), "other columns than a fifthline journal") {
		t.Errorf("open: %v", err)
	}
	if data, _ := os.ReadFile(path); string(data) != "shopping: rosin, strings\n" {
		t.Errorf("file changed: %q", data)
	}
}

func TestWithoutLogTheJournalIsSilent(t *testing.T) {
	var jf journalFlags
	j, err := jf.open(&env{})
	if err != nil || j.status() != "" || j.close() != nil {
		t.Errorf("open %v, status %q", err, j.status())
	}
	j.note(heldNote(quarterCommaG(t), "A4", 0, 0)) // a no-op, not a panic
}

// Every output format reports a failed write: stdout on a full disk is one
// line and exit 1, never a silent exit 0.
func TestAnalyzeFramesReportAFullDisk(t *testing.T) {
	full, err := os.OpenFile("/dev/full", os.O_WRONLY, 0)
	if err != nil {
		t.Skip("no /dev/full")
	}
	defer full.Close()
	wav := sox(t, "a4.wav", "-r", "48000", "synth 1 sine 440 gain -6") // A4 = 440 Hz (ISO 16)
	for _, format := range []string{"csv", "json", "table"} {
		var errb bytes.Buffer
		code := run(&env{ctx: context.Background(), stdin: strings.NewReader(""), stdout: full, stderr: &errb},
			[]string{"analyze", "--frames", "--format", format, wav})
		checkError(t, code, 1, errb.String())
	}
}

// A file that is no journal is refused from its first line, not read whole:
// /dev/zero, endless, gives one line and exit 1.
func TestReportRefusesAnEndlessNonJournal(t *testing.T) {
	if _, err := os.Stat("/dev/zero"); err != nil {
		t.Skip("no /dev/zero")
	}
	code, _, stderr := runCLI(t, "report", "/dev/zero")
	checkError(t, code, 1, stderr)
}
