package main

import (
	"path/filepath"
	"testing"
)

// A chord membership row in the journal is a player's note read within the
// chord, so it carries that player's channel as their note rows do
// (docs/interface.md: the journal's `channel`, counted from 1 as the file
// numbers its channels). Players picked out of order (3=vl2,1=vc) keep the
// file's numbers, not their place in --players. The take is soxQuartet's
// C major and G major chords (ISO 16 pitches).
func TestJournalChordRowsCarryTheirPlayersChannel(t *testing.T) {
	t.Parallel()
	log := filepath.Join(t.TempDir(), "rehearsal.csv")
	code, _, stderr := runLong(t, "analyze", "--players", "3=vl2,1=vc,2=vla", "--chords", "--log", log, soxQuartet(t))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	want := map[string]string{"vc": "1", "vla": "2", "vl2": "3"}
	_, rows := readCSVFile(t, log)
	members := 0
	for _, r := range rows {
		if r["channel"] != want[r["player"]] {
			t.Errorf("%s's row (chord %q, %s) has channel %q, want %s", r["player"], r["heard_chord"], r["note"], r["channel"], want[r["player"]])
		}
		if r["heard_chord"] != "" {
			members++
		}
	}
	if members < 6 {
		t.Errorf("%d chord membership rows, want both chords' three members:\n%v", members, rows)
	}
}
