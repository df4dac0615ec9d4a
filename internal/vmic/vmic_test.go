package vmic

import (
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"testing"
	"time"
)

// What is played into the private sink comes back out of its monitor: a
// 440 Hz tone made by sox, recorded by Record, measured by `sox stat`
// ("Rough frequency", SoX v14.4.2).
func TestPlayedToneIsRecorded(t *testing.T) {
	Isolate(t)
	dir := t.TempDir()
	tone, rec := filepath.Join(dir, "tone.wav"), filepath.Join(dir, "rec.wav")
	if out, err := exec.Command("sox", "-n", "-r", "48000", "-b", "16", tone, "synth", "1", "sine", "440", "vol", "0.25").CombinedOutput(); err != nil {
		t.Fatalf("sox: %v: %s", err, out)
	}
	stop := Record(t, rec)
	time.Sleep(300 * time.Millisecond) // let the recorder connect before the tone starts
	if err := Play(t, tone)(); err != nil {
		t.Fatalf("paplay: %v", err)
	}
	time.Sleep(300 * time.Millisecond) // the tail of the tone is still on its way
	if err := stop(); err != nil {
		t.Fatalf("parecord: %v", err)
	}
	out, err := exec.Command("sox", rec, "-n", "remix", "1", "stat").CombinedOutput()
	if err != nil {
		t.Fatalf("sox stat: %v: %s", err, out)
	}
	m := regexp.MustCompile(`Rough\s+frequency:\s+(\d+)`).FindSubmatch(out)
	if m == nil {
		t.Fatalf("sox stat gave no frequency:\n%s", out)
	}
	// One channel: sox stat takes deltas between interleaved samples.
	if hz, _ := strconv.Atoi(string(m[1])); hz < 430 || hz > 450 {
		t.Errorf("recorded rough frequency %d Hz, want about 440:\n%s", hz, out)
	}
}
