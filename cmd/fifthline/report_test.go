package main

import (
	"bufio"
	"context"
	"fmt"
	"image/png"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"

	"fifthline/journal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// heldNote is a held note at cents from its target in the tuning, the way
// the session hands it to the journal.
func heldNote(tu target.Tuning, note string, cents, start float64) session.Event {
	n, _ := target.ParseNote(note)
	hz := tu.Target(n) * math.Exp2(cents/1200) // the definition of the cent (common practice)
	return session.Event{Source: "mic", Held: pitchdetect.Held{Start: start, End: start + 1, Hz: hz, Frames: 50},
		Reading: tu.Classify(hz), Tuning: tu}
}

// logNotes writes events through the same glue listen, demo and analyze use.
func logNotes(t *testing.T, path, player string, evs ...session.Event) {
	t.Helper()
	jf := journalFlags{log: path, player: player}
	j, err := jf.open(&env{ctx: context.Background(), stderr: io.Discard})
	if err != nil {
		t.Fatal(err)
	}
	for _, ev := range evs {
		j.note(ev)
	}
	if err := j.close(); err != nil {
		t.Fatal(err)
	}
}

func quarterCommaG(t *testing.T) target.Tuning {
	tu := target.Default()
	tu.Key, _ = target.ParseKey("G major")
	tu.Temperament, _ = target.ParseTemperament("meantone:1/4")
	tu.A4 = 415
	return tu
}

func TestReportReadsWhatLogWrites(t *testing.T) {
	path := filepath.Join(t.TempDir(), "rehearsal.csv")
	tu := quarterCommaG(t)
	logNotes(t, path, "Ann",
		heldNote(tu, "F#4", 4, 0), heldNote(tu, "F#4", 6, 1), heldNote(tu, "F#4", 8, 2),
		heldNote(tu, "B4", -3, 3))
	logNotes(t, path, "Ben", heldNote(tu, "B4", 1, 0)) // a second session, appended
	code, out, stderr := runCLI(t, "report", "--format", "csv", path)
	if code != 0 || stderr != "" {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	_, rows := readCSV(t, out)
	row := func(player, level, note string) map[string]string {
		for _, r := range rows {
			if r["player"] == player && r["level"] == level && r["note"] == note {
				return r
			}
		}
		t.Fatalf("no %s %s %s row in\n%s", player, level, note, out)
		return nil
	}
	// F♯4 held at +4, +6, +8 ¢: mean 6, scatter (root-mean-square
	// deviation) √(8/3) = 1.63, one of three within ±5 ¢ (hand-computed); the
	// cents survive Hz → CSV → report to the journal's 0.01 ¢.
	f := row("Ann", "note", "F#4")
	for col, want := range map[string]string{"count": "3", "mean_cents": "6.00", "median_cents": "6.00",
		"scatter_cents": "1.63", "within": "1", "key": "G major", "temperament": "meantone:1/4", "tendency": "sits 6 ¢ sharp"} {
		if f[col] != want {
			t.Errorf("F#4 %s = %q, want %q", col, f[col], want)
		}
	}
	// Line of fifths: F♯ (+6) after B (+5).
	if a := row("Ann", "all", "all"); a["count"] != "4" || a["mean_cents"] != "3.75" {
		t.Errorf("Ann overall %v (want 4 notes, mean (4+6+8−3)/4 = 3.75)", a)
	}
	if b := row("Ben", "note", "B4"); b["count"] != "1" || b["mean_cents"] != "1.00" || b["scatter_cents"] != "" {
		t.Errorf("Ben's B4 %v", b)
	}
	code, out, _ = runCLI(t, "report", "--player", "ann", path)
	if code != 0 || !strings.Contains(out, "Ann · G major · 1/4-comma meantone · A4 = 415 Hz\n4 held notes\n") || strings.Contains(out, "Ben") {
		t.Errorf("table for Ann:\n%s", out)
	}
	lines := strings.Split(out, "\n")
	if bi, fi := indexPrefix(lines, "B4 "), indexPrefix(lines, "F#4 "); bi < 0 || fi < bi {
		t.Errorf("B4 at line %d, F#4 at %d: want B4 first, along the line of fifths\n%s", bi, fi, out)
	}
}

func indexPrefix(lines []string, p string) int {
	for i, l := range lines {
		if strings.HasPrefix(l, p) {
			return i
		}
	}
	return -1
}

// From a sound to the report: sox plays A4 10 ¢ sharp (440·2^(10/1200) =
// 442.549 Hz, the definition of the cent), analyze logs it, report reads it.
func TestReportOfAnAnalysedRecording(t *testing.T) {
	if _, err := exec.LookPath("sox"); err != nil {
		t.Skip("sox not installed")
	}
	wav := sox(t, "a4sharp.wav", "-r", "44100", "-b", "16", "synth 1.5 sine 442.549 vol 0.5")
	logPath := filepath.Join(t.TempDir(), "j.csv")
	if code, _, stderr := runCLI(t, "analyze", "--log", logPath, "--player", "Cleo", wav); code != 0 {
		t.Fatalf("analyze: %d %s", code, stderr)
	}
	code, out, stderr := runCLI(t, "report", "--format", "csv", logPath)
	if code != 0 {
		t.Fatalf("report: %d %s", code, stderr)
	}
	_, rows := readCSV(t, out)
	if len(rows) == 0 || rows[0]["note"] != "A4" || rows[0]["count"] != "1" || !closeTo(rows[0]["mean_cents"], "10", 0.5) || rows[0]["player"] != "Cleo" {
		t.Errorf("report %v", rows)
	}
}

func TestReportPlotsAPictureOfTheStatedSize(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "j.csv")
	tu := quarterCommaG(t)
	logNotes(t, path, "Ann", heldNote(tu, "D4", -2, 0), heldNote(tu, "D4", 2, 60), heldNote(tu, "C#5", 7, 120))
	for _, name := range []string{"wall.png", "wall.svg"} {
		out := filepath.Join(dir, name)
		if code, _, stderr := runCLI(t, "report", "--plot", out, path); code != 0 {
			t.Fatalf("%s: exit %d %s", name, code, stderr)
		}
		if name == "wall.png" {
			f, _ := os.Open(out)
			cfg, err := png.DecodeConfig(f)
			f.Close()
			// One player in one tuning: 12 × 4.4 in at 150 dpi.
			if err != nil || cfg.Width != 1800 || cfg.Height != 660 {
				t.Errorf("png %dx%d %v, want 1800x660", cfg.Width, cfg.Height, err)
			}
		} else if data, _ := os.ReadFile(out); !strings.Contains(string(data), "<svg") {
			t.Errorf("svg starts %.80q", data)
		}
	}
}

func TestReportBadJournalsAreOneLineErrors(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(body), 0o644)
		return p
	}
	analyzed := write("analyze.csv", "start_s,end_s,note,hz,target_hz,cents,alt_note,alt_cents\n0,1,A4,440,440,0,G##4,0\n")
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"missing file", []string{filepath.Join(dir, "none.csv")}, 1, "no such file"},
		{"a folder", []string{dir}, 1, "is a folder"},
		{"empty", []string{write("empty.csv", "")}, 1, "is empty"},
		{"garbage", []string{write("noise.csv", "\x89PNG\r\n\x1a\n\x00\x00")}, 1, "not a fifthline journal"},
		{"wrong columns", []string{analyzed}, 1, "columns missing: time"},
		{"header only", []string{write("new.csv", strings.Join(journal.Header(), ",")+"\n")}, 1, "no held notes in"},
		{"no journal given", nil, 2, "needs one or more journal"},
		{"unknown format", []string{"--format", "xml", analyzed}, 2, "--format"},
		{"plot as gif", []string{"--plot", "x.gif", analyzed}, 2, ".png or .svg"},
		{"no tolerance", []string{"--tolerance", "0", analyzed}, 2, "--tolerance"},
		{"by what", []string{"--by", "week", analyzed}, 2, "--by rehearsal"},
		{"since what", []string{"--since", "last week", analyzed}, 2, "--since"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, _, stderr := runCLI(t, append([]string{"report"}, c.args...)...)
			checkError(t, code, c.code, stderr)
			if !strings.Contains(stderr, c.want) {
				t.Errorf("stderr %q, want it to mention %q", stderr, c.want)
			}
		})
	}
}

func TestReportSkipsATornLastLineAndLaterAppendsAreFine(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	tu := quarterCommaG(t)
	logNotes(t, path, "Ann", heldNote(tu, "G4", 1, 0), heldNote(tu, "G4", 3, 1))
	data, _ := os.ReadFile(path)
	os.WriteFile(path, data[:len(data)-30], 0o644) // the writer died mid-line
	code, out, stderr := runCLI(t, "report", "--format", "csv", path)
	if code != 0 || !strings.Contains(stderr, "fifthline: warning: journal "+path+" line 3: incomplete last line") ||
		strings.Count(stderr, "\n") != 1 {
		t.Fatalf("exit %d, stderr %q", code, stderr)
	}
	if _, rows := readCSV(t, out); rows[0]["count"] != "1" {
		t.Errorf("rows %v, want the one whole note", rows)
	}
	logNotes(t, path, "Ann", heldNote(tu, "G4", 5, 0))
	code, out, stderr = runCLI(t, "report", "--format", "csv", path)
	if _, rows := readCSV(t, out); code != 0 || rows[0]["count"] != "2" || rows[0]["mean_cents"] != "3.00" {
		t.Errorf("after appending: exit %d, %v, stderr %q", code, rows, stderr)
	}
}

const killHelperEnv = "FIFTHLINE_TEST_REHEARSE_INTO"

// TestHelperRehearsal is not a test: run by TestKilledRehearsal in a child
// process, it logs a note every 10 ms through the --log glue until killed.
func TestHelperRehearsal(t *testing.T) {
	path := os.Getenv(killHelperEnv)
	if path == "" {
		t.Skip("helper process only")
	}
	jf := journalFlags{log: path, player: "Dana"}
	j, err := jf.open(&env{ctx: context.Background(), stderr: os.Stderr})
	if err != nil {
		t.Fatal(err)
	}
	tu := quarterCommaG(t)
	for i := 0; ; i++ {
		j.note(heldNote(tu, "A4", float64(i%5), float64(i)))
		fmt.Println("logged", i+1)
		time.Sleep(10 * time.Millisecond)
	}
}

// A rehearsal killed with SIGKILL leaves a journal report reads, holding
// every note logged before the kill.
func TestKilledRehearsal(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	cmd := exec.Command(os.Args[0], "-test.run=^TestHelperRehearsal$")
	cmd.Env = append(os.Environ(), killHelperEnv+"="+path)
	out, _ := cmd.StdoutPipe()
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	sc := bufio.NewScanner(out)
	logged := 0
	for logged < 15 && sc.Scan() {
		fmt.Sscanf(sc.Text(), "logged %d", &logged)
	}
	cmd.Process.Signal(syscall.SIGKILL)
	io.Copy(io.Discard, out)
	if err := cmd.Wait(); err == nil || !strings.Contains(err.Error(), "killed") {
		t.Fatalf("helper ended with %v, want killed", err)
	}
	code, csvOut, stderr := runCLI(t, "report", "--format", "csv", path)
	if code != 0 || strings.Count(stderr, "\n") > 1 {
		t.Fatalf("report: exit %d, %q", code, stderr)
	}
	_, rows := readCSV(t, csvOut)
	n, _ := strconv.Atoi(rows[len(rows)-1]["count"])
	if rows[len(rows)-1]["level"] != "all" || n < logged {
		t.Errorf("report counts %d notes after %d were logged", n, logged)
	}
	entries, _, _ := journal.ReadFile(path)
	for i, e := range entries { // whole, and in the order they ended
		if e.Start != float64(i) || e.Player != "Dana" {
			t.Errorf("entry %d: start %v player %q", i, e.Start, e.Player)
		}
	}
}

// --player naming nobody in the journals is an error (exit 1) that names
// the players there, so a misspelt name can be put right.
func TestReportForAPlayerNotThereNamesThoseThere(t *testing.T) {
	path := filepath.Join(t.TempDir(), "rehearsal.csv")
	tu := quarterCommaG(t)
	logNotes(t, path, "Ann", heldNote(tu, "F#4", 4, 0))
	logNotes(t, path, "Ben", heldNote(tu, "B4", 1, 0))
	code, _, stderr := runCLI(t, "report", "--player", "Anne", path)
	checkError(t, code, 1, stderr)
	if !strings.Contains(stderr, "no held notes in "+path+" by Anne (players there: Ann, Ben)") {
		t.Errorf("stderr %q", stderr)
	}
}

// report's --key is read as every command reads it (interface contract:
// `--key H` is a usage error, exit 2; a lone lower-case letter gets its
// hint), not matched as text that no journal holds.
func TestReportKeyIsReadAsEveryCommandReadsIt(t *testing.T) {
	path := filepath.Join(t.TempDir(), "rehearsal.csv")
	logNotes(t, path, "Ann", heldNote(quarterCommaG(t), "F#4", 4, 0))
	for key, says := range map[string]string{"H": "German H is B", "g": `say "G major" or "G minor"`} {
		code, _, stderr := runCLI(t, "report", "--key", key, path)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, says) {
			t.Errorf("--key %s: %q, want it to say %q", key, stderr, says)
		}
	}
	if code, out, stderr := runCLI(t, "report", "--key", "g major", path); code != 0 || !strings.Contains(out, "Ann · G major") {
		t.Errorf("--key \"g major\": exit %d, %q\n%s", code, stderr, out)
	}
}
