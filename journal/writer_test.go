package journal

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"fifthline/target"
)

func TestWriterCreatesWithHeaderAndWritesEachNoteAsItEnds(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	c := &clock{opening}
	w, err := Open(path, Meta{Player: "Ann, viola", Session: "s1", Now: c.now})
	if err != nil {
		t.Fatal(err)
	}
	c.t = opening.Add(3 * time.Second) // live: the note ends as it is written
	if err := w.Write(heldAt(10, 1.25, 2.5, "default input")); err != nil {
		t.Fatal(err)
	}
	// Handed to the kernel before Write returns: readable before Close.
	got, _ := os.ReadFile(path)
	// 440·2^(10/1200) = 442.5489 Hz is A4 +10 ¢ (definition of the cent, common
	// practice); it is offered no other spelling (contract: G𝄪4 and B𝄫4 carry
	// two accidentals more than A4), so alt_note and alt_cents are empty.
	// Its start lands 0.5 s later than opening+1.25 s: it ended 2.5 s into the
	// capture but 3 s after opening, so the capture began 0.5 s after opening.
	want := headerLine() +
		`2026-03-14T19:30:01.750+01:00,s1,default input,"Ann, viola",C major,equal,440,,,1.250,2.500,A4,442.5489,440.0000,10.00,,,false,false,1.50,0.0,0.00,,,,,,,a4` + "\n"
	if string(got) != want {
		t.Errorf("journal is\n%s\nwant\n%s", got, want)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

func TestWriterAppendsAcrossSessionsWithOneHeader(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	for i, player := range []string{"Ann", "Ben"} {
		w, err := Open(path, Meta{Player: player, Session: string(rune('a' + i))})
		if err != nil {
			t.Fatal(err)
		}
		w.Write(heldAt(0, 0, 1, "mic"))
		w.Write(heldAt(-5, 1, 2, "mic"))
		if err := w.Close(); err != nil {
			t.Fatal(err)
		}
	}
	data, _ := os.ReadFile(path)
	if n := strings.Count(string(data), headerLine()); n != 1 {
		t.Errorf("header appears %d times, want once", n)
	}
	entries, warns, err := ReadFile(path)
	if err != nil || len(warns) != 0 || len(entries) != 4 {
		t.Fatalf("read %d entries, warnings %q, err %v; want 4, none, nil", len(entries), warns, err)
	}
	if entries[0].Player != "Ann" || entries[3].Player != "Ben" || entries[3].Session != "b" {
		t.Errorf("players/sessions %q %q %q", entries[0].Player, entries[3].Player, entries[3].Session)
	}
}

func TestWriterPlacesFilesAnalysedInARowEndToEnd(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	c := &clock{opening}
	w, _ := Open(path, Meta{Now: c.now}) // the clock stands still: analysis is fast
	w.Write(heldAt(0, 0.5, 4, "one.wav"))
	w.Write(heldAt(0, 5, 9, "one.wav"))
	w.Write(heldAt(0, 1, 2, "two.wav")) // two.wav's second 1 is 9 s + 1 s in
	w.Close()
	entries, _, _ := ReadFile(path)
	var offsets []float64
	for _, e := range entries {
		offsets = append(offsets, e.Time.Sub(opening).Seconds())
	}
	if want := []float64{0.5, 5, 10}; !equalFloats(offsets, want) {
		t.Errorf("seconds after opening %v, want %v", offsets, want)
	}
}

// Players heard together live overlap: a chord's notes start together and
// each is written as it ends, a player at a time. Each keeps its place in
// the capture (the run's clock does not restart because one note began
// before the last one ended).
func TestWriterKeepsOverlappingPlayersNotesOnOneClock(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	c := &clock{opening}
	w, _ := Open(path, Meta{Now: c.now})
	c.t = opening.Add(3 * time.Second)                     // the chord ends 3 s after opening
	for _, start := range []float64{1.008, 1.019, 1.029} { // each ends at 3 s
		ev := heldAt(0, start, 3, "interface")
		ev.Player = "p"
		w.Write(ev)
	}
	c.t = opening.Add(5 * time.Second)
	w.Write(heldAt(0, 3.05, 5, "interface"))
	w.Close()
	entries, _, _ := ReadFile(path)
	var offsets []float64
	for _, e := range entries {
		offsets = append(offsets, e.Time.Sub(opening).Seconds())
	}
	if want := []float64{1.008, 1.019, 1.029, 3.05}; !equalFloats(offsets, want) {
		t.Errorf("seconds after opening %v, want %v", offsets, want)
	}
}

// A take analysed weeks after it was played keeps its own time: each note
// is the recording's start plus its offset, whatever the clock says now.
func TestWriterPlacesARecordingAtItsOwnTime(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	c := &clock{opening}
	w, _ := Open(path, Meta{Now: c.now})
	played := time.Date(2026, 2, 3, 19, 30, 5, 0, time.UTC)
	w.WriteAt(heldAt(0, 0.5, 4, "take.wav"), played)
	w.WriteAt(heldAt(0, 62.25, 63, "take.wav"), played)
	w.Write(heldAt(0, 1, 2, "live")) // a live note still takes the clock
	w.Close()
	entries, _, _ := ReadFile(path)
	want := []time.Time{played.Add(500 * time.Millisecond), played.Add(62250 * time.Millisecond), opening.Add(time.Second)}
	for i, e := range entries {
		if i >= len(want) || !e.Time.Equal(want[i]) {
			t.Errorf("note %d at %v, want %v", i, e.Time, want[min(i, len(want)-1)])
		}
	}
	if len(entries) != len(want) {
		t.Errorf("%d notes, want %d", len(entries), len(want))
	}
}

func equalFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if d := a[i] - b[i]; d > 1e-3 || d < -1e-3 {
			return false
		}
	}
	return true
}

func TestWriterRefusesWhatIsNotItsJournal(t *testing.T) {
	dir := t.TempDir()
	other := filepath.Join(dir, "other.csv")
	os.WriteFile(other, []byte("start_s,end_s,note,hz\n1,2,A4,440\n"), 0o644)
	cases := map[string]string{
		"a file with other columns": other,
		"a folder":                  dir,
		"a missing folder":          filepath.Join(dir, "nowhere", "j.csv"),
	}
	for name, path := range cases {
		t.Run(name, func(t *testing.T) {
			before, _ := os.ReadFile(path)
			w, err := Open(path, Meta{})
			if err == nil {
				w.Close()
				t.Fatal("opened; want a refusal")
			}
			if strings.Contains(err.Error(), "\n") || !strings.Contains(err.Error(), path) {
				t.Errorf("error %q: want one line naming the path", err)
			}
			// A missing folder is named as such, not as a missing file.
			if name == "a missing folder" && !strings.Contains(err.Error(), "its folder "+filepath.Dir(path)+" does not exist") {
				t.Errorf("error %q: want the missing folder named", err)
			}
			if after, _ := os.ReadFile(path); string(after) != string(before) {
				t.Errorf("file changed to %q", after)
			}
		})
	}
}

func TestWriterMendsATornLastLineBeforeAppending(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	w, _ := Open(path, Meta{})
	w.Write(heldAt(3, 0, 1, "mic"))
	w.Close()
	whole, _ := os.ReadFile(path)
	torn := string(whole) + string(whole[len(headerLine()):len(whole)/2+len(headerLine())/2])
	os.WriteFile(path, []byte(torn), 0o644) // a crash mid-line
	w, _ = Open(path, Meta{})
	w.Write(heldAt(-4, 0, 1, "mic"))
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	entries, warns, err := ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 2 || len(warns) != 1 {
		t.Fatalf("%d entries, warnings %q; want 2 entries and one warning for the torn line", len(entries), warns)
	}
	if entries[0].Note != entries[1].Note || entries[1].Cents > -3.99 || entries[1].Cents < -4.01 {
		t.Errorf("entries %+v", entries)
	}
}

func TestWriterRestartsAHeaderTornAtCreation(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	os.WriteFile(path, []byte(headerLine()[:20]), 0o644)
	w, err := Open(path, Meta{})
	if err != nil {
		t.Fatal(err)
	}
	w.Write(heldAt(0, 0, 1, "mic"))
	w.Close()
	if entries, warns, err := ReadFile(path); err != nil || len(entries) != 1 || len(warns) != 0 {
		t.Errorf("%d entries, %q, %v", len(entries), warns, err)
	}
}

// A full disk must not stop the session: Write reports, Status says so,
// Close counts what was lost. /dev/full fails every write with ENOSPC.
func TestWriterOnAFullDiskKeepsGoingAndSaysSo(t *testing.T) {
	if _, err := os.Stat("/dev/full"); err != nil {
		t.Skip("no /dev/full")
	}
	w, err := Open("/dev/full", Meta{})
	if err != nil {
		t.Fatalf("Open refused: %v; want a writer that reports", err)
	}
	for i := range 3 {
		if err := w.Write(heldAt(0, float64(i), float64(i)+1, "mic")); !errors.Is(err, syscall.ENOSPC) {
			t.Errorf("Write: %v, want no space left", err)
		}
	}
	if s := w.Status(); !strings.Contains(s, "no space left on device") || !strings.Contains(s, "3 not logged") {
		t.Errorf("Status %q", s)
	}
	err = w.Close()
	if err == nil || !strings.Contains(err.Error(), "3 of 3 notes not logged") {
		t.Errorf("Close: %v", err)
	}
}

func TestStatusCountsNotes(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	w, _ := Open(path, Meta{})
	w.Write(heldAt(0, 0, 1, "mic"))
	if s := w.Status(); s != "journal: 1 note → "+path {
		t.Errorf("Status %q", s)
	}
	w.Close()
}

// The time column agrees with start_s to the millisecond: both are rounded,
// so a note 2.3946 s into a take is at .395 in each (a script that joins
// them finds the same instant).
func TestWriterTimeRoundsAsStartDoes(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	w, _ := Open(path, Meta{Now: (&clock{opening}).now})
	played := time.Date(2026, 2, 3, 19, 30, 5, 0, time.UTC)
	w.WriteAt(heldAt(0, 2.3946, 4, "take.wav"), played)
	w.Close()
	data, _ := os.ReadFile(path)
	if !strings.Contains(string(data), "2026-02-03T19:30:07.395Z,") || !strings.Contains(string(data), ",2.395,") {
		t.Errorf("want time .395 beside start_s 2.395:\n%s", data)
	}
}

// A note heard live may be written long after it ended: its row waits
// until the chords it sounds in are known (a bass held 30 s under a run of
// chords). Its time is still when it was played: the clock reads it as of
// when its end was heard (WriteHeard), not when it is written. Written
// with Write instead, the 28 s wait would move it and every note of the
// run after it by 28 s (the run's clock starts where the first note's
// write says the capture began). Our own scenario: capture from the
// journal's opening, a note 1–2 s written at 30 s, then one 31–32 s
// written as it ends.
func TestWriterPlacesANoteWrittenLateAtItsTime(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	c := &clock{opening}
	w, _ := Open(path, Meta{Now: c.now})
	c.t = opening.Add(30 * time.Second)
	w.WriteHeard(heldAt(0, 1, 2, "interface"), Extra{}, opening.Add(2*time.Second))
	c.t = opening.Add(32 * time.Second)
	w.WriteHeard(heldAt(0, 31, 32, "interface"), Extra{}, time.Time{}) // zero: heard now
	w.Close()
	entries, _, _ := ReadFile(path)
	var offsets []float64
	for _, e := range entries {
		offsets = append(offsets, e.Time.Sub(opening).Seconds())
	}
	if want := []float64{1, 31}; !equalFloats(offsets, want) {
		t.Errorf("seconds after opening %v, want %v", offsets, want)
	}
}

// A declared 7 or m7 chord's seventh is tuned at --seventh, so the chord
// column says which (as the one-line tuning does): notes read against 16/9
// and against 7/4 (common practice) are different tunings to report. A
// triad's chord column is the chord alone.
func TestTheChordColumnSaysADeclaredChordsSeventh(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	w, err := Open(path, Meta{Session: "s1", Now: (&clock{opening}).now})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		chord   string
		seventh float64
	}{{"G 7", 7.0 / 4}, {"G 7", 0}, {"D major", 0}} {
		ev := heldAt(0, 1, 2, "take.wav")
		if ev.Tuning.Chord, err = target.ParseChord(c.chord); err != nil {
			t.Fatal(err)
		}
		ev.Tuning.Chord.Seventh = c.seventh
		if err := w.Write(ev); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	es, warns, err := ReadFile(path)
	if err != nil || len(warns) != 0 || len(es) != 3 {
		t.Fatalf("%d entries, %q, %v", len(es), warns, err)
	}
	for i, want := range []string{"G 7 (seventh 7/4)", "G 7 (seventh 16/9)", "D major"} {
		if es[i].Chord != want {
			t.Errorf("row %d: chord %q, want %q", i+1, es[i].Chord, want)
		}
	}
}
