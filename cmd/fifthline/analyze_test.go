package main

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"
)

// --frames: the frame track with the contract's time_s,hz,confidence; hz is
// empty where there is no pitch (here, sox's half second of silence).
func TestAnalyzeFrameTrack(t *testing.T) {
	path := sox(t, "a.wav", "-r", "48000", "-b", "16", "synth 0.5 sine 440 gain -6 pad 0 0.5")
	code, out, stderr := runCLI(t, "analyze", "--frames", path)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	header, rows := readCSV(t, out)
	if strings.Join(header[:3], ",") != "time_s,hz,confidence" {
		t.Fatalf("header %v", header)
	}
	voiced, silent := 0, 0
	for _, r := range rows {
		var at float64
		fmt.Sscan(r["time_s"], &at)
		switch {
		case r["hz"] == "":
			silent++
		case at > 0.45 && at < 0.55:
			// The window straddles the tone's end; only the steady part counts.
		case closeTo(r["hz"], "440", 0.01):
			voiced++
		default:
			t.Errorf("frame %v: neither 440 Hz (sox) nor empty", r)
		}
	}
	if voiced < 20 || silent < 20 {
		t.Errorf("%d voiced and %d silent frames", voiced, silent)
	}
}

func TestAnalyzeJSONAndTable(t *testing.T) {
	path := sox(t, "a.wav", "-r", "44100", "-b", "16", "synth 0.8 sine 392 gain -6")
	code, out, _ := runCLI(t, "analyze", "--format", "json", path)
	var notes []map[string]any
	if err := json.Unmarshal([]byte(out), &notes); code != 0 || err != nil || len(notes) != 1 {
		t.Fatalf("exit %d, %v: %s", code, err, out)
	}
	// 392 Hz is G4 in equal temperament at ISO 16's 440 Hz, 0.05 ¢ flat of
	// 391.995 Hz (standard frequency tables). G is offered no other spelling
	// (F𝄪 and A𝄫 carry two accidentals more; contract), so alt_note is null.
	if notes[0]["note"] != "G4" || notes[0]["hz"].(float64) < 391.9 || notes[0]["alt_note"] != nil || notes[0]["on_other_spelling"] != false {
		t.Errorf("json note %v", notes[0])
	}
	code, out, _ = runCLI(t, "analyze", "--format", "table", "--temperament", "pythagorean", path)
	if code != 0 || !strings.Contains(out, "G4") || !strings.Contains(out, "Pythagorean") {
		t.Errorf("table:\n%s", out)
	}
}

// A file with no notes still gives the CSV header, so scripts can rely on it.
func TestAnalyzeSilenceGivesHeaderOnly(t *testing.T) {
	path := sox(t, "quiet.wav", "-r", "48000", "-b", "16", "trim 0 1")
	code, out, _ := runCLI(t, "analyze", path)
	if code != 0 || !strings.HasPrefix(out, "start_s,end_s,note,") || strings.Count(out, "\n") != 1 {
		t.Errorf("exit %d, output %q", code, out)
	}
}
