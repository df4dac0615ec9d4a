package main

import (
	"encoding/json"
	"testing"
)

// JSON keeps numbers numbers and leaves out what is not there as null: the
// frame track of a sox tone at 440 Hz (Debian sox; its synth frequency is
// the truth) followed by half a second of silence.
func TestFrameTrackJSON(t *testing.T) {
	path := sox(t, "a.wav", "-r", "48000", "-b", "16", "synth 0.5 sine 440 gain -6 pad 0 0.5")
	for _, files := range [][]string{{path}, {path, path}} {
		code, out, stderr := runCLI(t, append([]string{"analyze", "--frames", "--format", "json"}, files...)...)
		if code != 0 {
			t.Fatalf("exit %d: %s", code, stderr)
		}
		var frames []map[string]any
		if err := json.Unmarshal([]byte(out), &frames); err != nil || len(frames) == 0 {
			t.Fatalf("%v: %s", err, out)
		}
		voiced, silent := 0, 0
		for _, f := range frames {
			if _, ok := f["file"]; ok != (len(files) > 1) {
				t.Fatalf("frame %v: a file name only with several files", f)
			}
			switch hz, _ := f["hz"].(float64); {
			case f["hz"] == nil && f["note"] == nil && f["cents"] == nil && f["voiced"] == false:
				silent++
			case hz > 439.99 && hz < 440.01 && f["note"] == "A4":
				voiced++
			}
		}
		if voiced < 20 || silent < 20 {
			t.Errorf("%d files: %d frames at 440 Hz, %d silent with nulls", len(files), voiced, silent)
		}
	}
}
