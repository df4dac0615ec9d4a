package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"fifthline/journal"
)

// twoNotes is a take of two held tones with silence between, so the second
// note's offset in the file is well away from zero: A4 then D5 (sox).
func twoNotes(t *testing.T) string {
	t.Helper()
	return sox(t, "take.wav", "-r", "48000", "-b", "24", "synth 0.8 sine 440 gain -6 pad 1 0.5 : synth 0.8 sine 587.33 gain -6")
}

// loggedTimes analyses the files into a fresh journal and returns each
// note's journal time less its offset in the file — the take's start as the
// journal has it — and the offsets.
func loggedTimes(t *testing.T, args ...string) (starts []time.Time, offsets []float64) {
	t.Helper()
	log := filepath.Join(t.TempDir(), "rehearsals.csv")
	code, _, stderr := runCLI(t, append([]string{"analyze", "--log", log}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	entries, _, err := journal.ReadFile(log)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		starts = append(starts, e.Time.Add(-seconds(e.Start)))
		offsets = append(offsets, e.Start)
	}
	return starts, offsets
}

func seconds(s float64) time.Duration { return time.Duration(s * float64(time.Second)) }

// checkStarts: every note of the take is logged at want plus its offset
// (the journal keeps milliseconds).
func checkStarts(t *testing.T, what string, starts []time.Time, offsets []float64, want time.Time) {
	t.Helper()
	if len(starts) != 2 || offsets[1] < 2 {
		t.Fatalf("%s: %d notes at %v s, want 2 (A4 at 1 s, D5 at 2.3 s: sox pad and synth)", what, len(starts), offsets)
	}
	for i, s := range starts {
		if d := s.Sub(want); d < -time.Millisecond || d > time.Millisecond {
			t.Errorf("%s: note %d logged at %v less its offset %.3f s = %v, want %v", what, i, s.Add(seconds(offsets[i])), offsets[i], s, want)
		}
	}
}

// --recorded says when the take was played, in the forms a musician types;
// times without a zone are the local time.
func TestAnalyzeRecordedPlacesTheTakeInTheJournal(t *testing.T) {
	take := twoNotes(t)
	for _, c := range []struct {
		flag string
		want time.Time
	}{
		{"2026-11-24", time.Date(2026, 11, 24, 0, 0, 0, 0, time.Local)},
		{"2026-11-24 19:30", time.Date(2026, 11, 24, 19, 30, 0, 0, time.Local)},
		{"2026-11-24T19:30:15", time.Date(2026, 11, 24, 19, 30, 15, 0, time.Local)},
		{"2026-11-24T19:30:00+01:00", time.Date(2026, 11, 24, 18, 30, 0, 0, time.UTC)}, // RFC 3339
	} {
		starts, offsets := loggedTimes(t, "--recorded", c.flag, take)
		checkStarts(t, c.flag, starts, offsets, c.want)
	}
}

// Without --recorded, a Broadcast Wave take's bext origination date and
// time (EBU Tech 3285; written here by ffmpeg's Broadcast Wave writer) is
// its start; --recorded still wins over it.
func TestAnalyzeLogsABroadcastWaveTakeAtItsOriginationTime(t *testing.T) {
	if _, err := exec.LookPath("ffmpeg"); err != nil {
		t.Fatalf("ffmpeg not found (make test installs it): %v", err)
	}
	take := twoNotes(t)
	bwf := filepath.Join(t.TempDir(), "bwf.wav")
	out, err := exec.Command("ffmpeg", "-nostdin", "-v", "error", "-i", take, "-c:a", "pcm_s24le", "-write_bext", "1",
		"-metadata", "origination_date=2026-11-24", "-metadata", "origination_time=19:30:05", bwf).CombinedOutput()
	if err != nil {
		t.Fatalf("ffmpeg: %v %s", err, out)
	}
	starts, offsets := loggedTimes(t, bwf)
	checkStarts(t, "bext", starts, offsets, time.Date(2026, 11, 24, 19, 30, 5, 0, time.Local))
	starts, offsets = loggedTimes(t, "--recorded", "2026-12-01 10:00", bwf)
	checkStarts(t, "--recorded over bext", starts, offsets, time.Date(2026, 12, 1, 10, 0, 0, 0, time.Local))
}

// A plain WAV says nothing of when it was played: its modification time
// stands for the start (the contract).
func TestAnalyzeLogsAPlainTakeAtItsFileTime(t *testing.T) {
	take := twoNotes(t)
	mtime := time.Date(2026, 10, 6, 20, 15, 0, 0, time.Local)
	if err := os.Chtimes(take, mtime, mtime); err != nil {
		t.Fatal(err)
	}
	starts, offsets := loggedTimes(t, take)
	checkStarts(t, "modification time", starts, offsets, mtime)
	// A time of day alone (the contract's --recorded DATE|TIME) is on the
	// file's own date: a take analysed the evening it was played.
	starts, offsets = loggedTimes(t, "--recorded", "19:05", take)
	checkStarts(t, "--recorded 19:05", starts, offsets, time.Date(2026, 10, 6, 19, 5, 0, 0, time.Local))
}

func TestAnalyzeRecordedThatIsNoTimeIsAUsageError(t *testing.T) {
	take := twoNotes(t)
	for _, bad := range []string{"yesterday", "24.11.2026", "2026-11-31", "2026-11-24 25:00", "25:00", "19:30 tonight"} {
		code, stdout, stderr := runCLI(t, "analyze", "--recorded", bad, take)
		checkError(t, code, 2, stderr)
		if stdout != "" || !strings.Contains(stderr, "--recorded") {
			t.Errorf("--recorded %q: stdout %q, stderr %q", bad, stdout, stderr)
		}
	}
}

// FuzzRecordedFlag: any --recorded value is a time or a one-line refusal.
// Run: go test -run '^$' -fuzz FuzzRecordedFlag -fuzztime 20s ./cmd/fifthline/
func FuzzRecordedFlag(f *testing.F) {
	for _, s := range []string{"2026-11-24", "2026-11-24 19:30", "2026-11-24T19:30:00+01:00", "yesterday"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var r recordedFlag
		if err := r.Set(s); err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("error spans lines: %q", err)
			}
			return
		}
		if r.at.IsZero() && s != "0001-01-01" && !strings.HasPrefix(s, "0001-01-01") {
			t.Fatalf("%q accepted as the zero time", s)
		}
	})
}
