package journal

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// The test binary doubles as a journal-writing helper process, so that a
// test can run a writer without write permission. (A writer killed with
// SIGKILL is tested through the --log glue in cmd/fifthline.)
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
	if role == "readonly" {
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
