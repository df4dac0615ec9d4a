package source_test

import (
	"os/exec"
	"strings"
	"testing"
)

// The pure core compiles without cgo: nothing it depends on has C files,
// so CGO_ENABLED=0 go build of it succeeds on a machine without
// PortAudio's headers (make vet builds it so too). go list is the Go
// tool's own account of each package's files.
func TestCoreNeedsNoCgo(t *testing.T) {
	core := []string{"source", "target", "pitchdetect", "session", "journal", "report", "drone", "ui"}
	args := []string{"list", "-deps", "-f", "{{.ImportPath}} {{len .CgoFiles}}"}
	for _, p := range core {
		args = append(args, "fifthline/"+p)
	}
	cmd := exec.Command("go", args...)
	cmd.Env = append(cmd.Environ(), "CGO_ENABLED=1") // list what cgo would compile
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("go list: %v", err)
	}
	seen := 0
	for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
		path, n, _ := strings.Cut(line, " ")
		seen++
		if n != "0" || strings.Contains(path, "portaudio") {
			t.Errorf("%s (%s cgo files) is a dependency of the pure core", path, n)
		}
	}
	if seen < len(core) {
		t.Errorf("go list named %d packages, fewer than the %d asked for", seen, len(core))
	}
}
