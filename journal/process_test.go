package journal

import (
	"bufio"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// The test binary doubles as a journal-writing helper process, so that the
// tests can kill a real writer and run one without write permission.
const helperEnv = "FIFTHLINE_JOURNAL_HELPER"

func TestMain(m *testing.M) {
	if role := os.Getenv(helperEnv); role != "" {
		os.Exit(helper(role, os.Getenv("JOURNAL")))
	}
	os.Exit(m.Run())
}

func helper(role, path string) int {
	w, err := Open(path, Meta{Player: "helper"})
	if err != nil {
		fmt.Println("refused:", err)
		return 1
	}
	switch role {
	case "rehearse": // a note ends every 10 ms until killed
		for i := 0; ; i++ {
			w.Write(heldAt(float64(i%7), float64(i), float64(i)+0.9, "mic"))
			fmt.Println("wrote", i+1)
			time.Sleep(10 * time.Millisecond)
		}
	case "readonly":
		fmt.Println("write:", w.Write(heldAt(0, 0, 1, "mic")))
		fmt.Println("status:", w.Status())
		fmt.Println("close:", w.Close())
	}
	return 0
}

func helperCmd(t *testing.T, role, path string) *exec.Cmd {
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	cmd.Env = append(os.Environ(), helperEnv+"="+role, "JOURNAL="+path)
	return cmd
}

// Killing the writer with SIGKILL mid-rehearsal keeps every note it had
// written: each line reaches the kernel as the note ends.
func TestKilledWriterLosesNoWrittenNote(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	cmd := helperCmd(t, "rehearse", path)
	out, _ := cmd.StdoutPipe()
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	sc := bufio.NewScanner(out)
	reported := 0
	for reported < 12 && sc.Scan() {
		fmt.Sscanf(sc.Text(), "wrote %d", &reported)
	}
	cmd.Process.Signal(syscall.SIGKILL)
	io.Copy(io.Discard, out)
	cmd.Wait()
	entries, warns, err := ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) < reported || len(warns) > 1 {
		t.Errorf("journal holds %d notes (warnings %q) after the writer said it wrote %d", len(entries), warns, reported)
	}
	for i, e := range entries {
		if e.Start != float64(i) || e.Player != "helper" {
			t.Errorf("entry %d: start %v player %q", i, e.Start, e.Player)
		}
	}
}

// A read-only journal does not stop the session; it says why nothing is
// logged. Root writes anyway, so as root the helper runs as nobody.
func TestReadOnlyJournalKeepsGoingAndSaysSo(t *testing.T) {
	dir, err := os.MkdirTemp("", "journal-ro")
	if err != nil {
		t.Fatal(err)
	}
	defer os.RemoveAll(dir)
	os.Chmod(dir, 0o755)
	path := filepath.Join(dir, "j.csv")
	os.WriteFile(path, []byte(headerLine()), 0o444)
	cmd := helperCmd(t, "readonly", path)
	if os.Geteuid() == 0 {
		bin := filepath.Join(dir, "helper")
		copyFile(t, os.Args[0], bin)
		cmd.Path, cmd.Args[0] = bin, bin
		cmd.SysProcAttr = &syscall.SysProcAttr{Credential: &syscall.Credential{Uid: 65534, Gid: 65534}}
	}
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("helper: %v\n%s", err, out)
	}
	for _, want := range []string{"write: cannot open " + path + ": permission denied",
		"status: journal: cannot open " + path + ": permission denied — 1 not logged",
		"close: journal: cannot open " + path + ": permission denied (1 of 1 notes not logged)"} {
		if !strings.Contains(string(out), want) {
			t.Errorf("helper said\n%s\nwant a line %q", out, want)
		}
	}
	if data, _ := os.ReadFile(path); string(data) != headerLine() {
		t.Errorf("read-only journal changed: %q", data)
	}
}

func copyFile(t *testing.T, from, to string) {
	data, err := os.ReadFile(from)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(to, data, 0o755); err != nil {
		t.Fatal(err)
	}
}
