package capture

import (
	"bytes"
	"encoding/binary"
	"errors"
	"io"
	"math"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fifthline/source"
)

// sox is the reference tool (Debian package sox, SoX v14.4.2 here): it makes
// the test files and, decoding them itself, says what their samples are.
func sox(t testing.TB, args ...string) []byte {
	t.Helper()
	out, err := exec.Command("sox", args...).Output()
	if err != nil {
		msg := ""
		if ee, ok := err.(*exec.ExitError); ok {
			msg = string(ee.Stderr)
		}
		t.Fatalf("sox %s: %v %s (install the Debian package sox)", strings.Join(args, " "), err, msg)
	}
	return out
}

// soxFile makes dir/name with sox: args go between "-n" and the name, then
// the synth effect follows.
func soxFile(t testing.TB, dir, name string, format []string, synth ...string) string {
	t.Helper()
	path := filepath.Join(dir, name)
	args := append(append([]string{"-n"}, format...), path, "synth")
	sox(t, append(args, synth...)...)
	return path
}

// soxInfo asks `sox --i -X path` for one header fact (-r rate, -c channels,
// -s samples per channel).
func soxInfo(t testing.TB, flag, path string) int64 {
	t.Helper()
	v, err := strconv.ParseFloat(strings.TrimSpace(string(sox(t, "--i", flag, path))), 64)
	if err != nil {
		t.Fatalf("sox --i %s %s: %v", flag, path, err)
	}
	return int64(v)
}

// soxSamples is sox's own decoding of one channel (1-based) as 32-bit float,
// dither off so nothing is added.
func soxSamples(t testing.TB, path string, channel int) []float32 {
	t.Helper()
	raw := sox(t, "-D", path, "-t", "f32", "-", "remix", strconv.Itoa(channel))
	out := make([]float32, len(raw)/4)
	if err := binary.Read(bytes.NewReader(raw), binary.LittleEndian, out); err != nil {
		t.Fatal(err)
	}
	return out
}

// readAll drains a Source in blocks of the given size.
func readAll(t testing.TB, s source.Source, block int) []float32 {
	t.Helper()
	var all []float32
	buf := make([]float32, block)
	for {
		n, err := s.Read(buf)
		all = append(all, buf[:n]...)
		if err != nil {
			if !errors.Is(err, io.EOF) {
				t.Fatalf("Read: %v", err)
			}
			return all
		}
		if n == 0 {
			t.Fatal("Read returned 0 samples and no error")
		}
	}
}

// maxDiff is the largest absolute sample difference.
func maxDiff(a, b []float32) float64 {
	d := 0.0
	for i := range min(len(a), len(b)) {
		d = math.Max(d, math.Abs(float64(a[i])-float64(b[i])))
	}
	return d
}
