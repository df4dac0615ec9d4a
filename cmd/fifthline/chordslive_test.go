package main

import (
	"cmp"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"fifthline/harmony"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// The voices' chords written while listening are those the file analysis
// finds (chordsOf), a voice lost for a moment under a held chord bridged
// as there, though each note is given only as it ends, and most are
// written before listening stops. Our own scenario, five times over: C3,
// E4 and G4 (E4 lost for 0.5 s in the middle), then A2 with E4; C3 in
// equal temperament from A4 = 440 Hz (ISO 16), E4 and G4 its just tenth
// and twelfth (5/2, 3), E4 at 330 Hz the twelfth of A2 at 110 Hz (common
// practice).
func TestLiveVoiceChordsAreTheFilesChords(t *testing.T) {
	const c3 = 130.8128 // 440·2^(−21/12)
	tu := target.Default()
	var notes []voiceNote
	for k := range 5 {
		o := 4.2 * float64(k)
		for _, n := range []struct {
			voice        int
			hz, from, to float64
		}{{1, c3, 0, 2}, {2, c3 * 5 / 2, 0, 0.9}, {2, c3 * 5 / 2, 1.4, 2}, {3, c3 * 3, 0, 2}, {1, 110, 2.5, 3.8}, {2, 330, 2.5, 3.8}} {
			// Read at its Hz (no frames): the bridging is what is checked.
			notes = append(notes, heldVoiceNote(tu, n.voice, n.hz, o+n.from, o+n.to))
		}
	}
	got, want, early, rows := liveAndFileChords(notes, tu)
	if len(want) != 10 || !slices.Equal(got, want) {
		t.Errorf("live %v, from the file %v (want 10: C major and A open fifth, five times)", got, want)
	}
	if early < 8 {
		t.Errorf("%d of %d chords written before listening stopped", early, len(got))
	}
	// The note rows are the file's too, each spelled as its chord spells
	// it (spellVoicesFromChords), every note written once.
	file := slices.Clone(notes)
	spellVoicesFromChords(file, chordsOf(file, tu, target.DefaultSeventh))
	for _, n := range file {
		if w, g := strings.Join(n.Record(false), ","), rows[voiceStart{strconv.Itoa(n.voice), n.Start}]; g != w {
			t.Errorf("voice %d's note at %.2f s written live as %q, from the file %q", n.voice, n.Start, g, w)
		}
	}
	if len(rows) != len(notes) {
		t.Errorf("%d note rows written live, want %d", len(rows), len(notes))
	}
}

// liveAndFileChords reads the notes' chords as listening does, each note
// given as it ends, and as the file analysis does (chordsOf): each chord's
// name and start, how many were written before listening stopped, and the
// note rows written live.
func liveAndFileChords(notes []voiceNote, tu target.Tuning) (got, want []string, early int, rows map[voiceStart]string) {
	for _, c := range chordsOf(slices.Clone(notes), tu, target.DefaultSeventh) {
		want = append(want, c.Name()+"@"+target.Decimal(c.Start, 2))
	}
	rows = map[voiceStart]string{} // each note's row as written live
	vo := voiceOptions{chords: true, seventh: target.DefaultSeventh}
	live := vo.liveChords(session.NewTunings(tu), func(c harmony.Chord, voices []int, _ []bool, _ target.Tuning) error {
		got = append(got, c.Name()+"@"+target.Decimal(c.Start, 2))
		return nil
	}, func(n voiceNote) error {
		rows[voiceStart{strconv.Itoa(n.voice), n.Start}] = strings.Join(n.Record(false), ",")
		return nil
	})
	byEnd := slices.Clone(notes)
	slices.SortFunc(byEnd, func(a, b voiceNote) int { return cmp.Compare(a.End, b.End) })
	for i, n := range byEnd {
		live.note(n)
		earliest := n.End
		for _, later := range byEnd[i+1:] {
			earliest = min(earliest, later.Start)
		}
		live.ready(n.End, earliest, nil)
	}
	early = len(got)
	live.ready(math.Inf(1), math.Inf(1), nil)
	return got, want, early, rows
}

// The pieces of a chord that one microphone splits off (harmony's
// FragmentSeconds) are left out while listening as in the file: our own
// scenario, four times over, C3 E4 G4 with B5 heard for 0.35 s as the
// chord begins and C3 released 0.4 s early, then A2 and C5 with E4
// entering 0.3 s late, E4 and C5 held 0.45 s after A2 ends. Pitches in
// equal temperament from A4 = 440 Hz (ISO 16; tu.Target), chord names
// common practice.
func TestLiveVoiceChordsLeaveOutThePiecesAsTheFileDoes(t *testing.T) {
	tu := target.Default()
	at := func(name string) float64 { n, _ := target.ParseNote(name); return tu.Target(n) }
	var notes []voiceNote
	for k := range 4 {
		o := 5.0 * float64(k)
		notes = append(notes, heldVoiceNote(tu, 1, at("C3"), o, o+2.1), heldVoiceNote(tu, 2, at("E4"), o, o+2.5),
			heldVoiceNote(tu, 3, at("G4"), o, o+2.5), heldVoiceNote(tu, 4, at("B5"), o, o+0.35),
			heldVoiceNote(tu, 1, at("A2"), o+3, o+4.2), heldVoiceNote(tu, 2, at("E4"), o+3.3, o+4.65),
			heldVoiceNote(tu, 3, at("C5"), o+3, o+4.65))
	}
	got, want, _, _ := liveAndFileChords(notes, tu)
	if len(want) != 8 || !slices.Equal(got, want) {
		t.Errorf("live %v, from the file %v (want 8: C major and A minor, four times)", got, want)
	}
}

// heldVoiceNote is a voice's note read at hz (no frames).
func heldVoiceNote(tu target.Tuning, voice int, hz, from, to float64) voiceNote {
	return voiceNote{Event: session.Event{Held: pitchdetect.Held{Start: from, End: to, Hz: hz}, Reading: tu.Classify(hz), Tuning: tu}, voice: voice}
}

// Each chord is read in the tuning in force at its end: a change noted at
// a moment holds from that moment on, and forgetting keeps the one in
// force at the time kept.
func TestTuningLogGivesTheTuningInForce(t *testing.T) {
	first := target.Default()
	later := first
	later.A4 = 415
	src := session.NewTunings(first)
	l := newTuningLog(src)
	l.moment(1)
	src.Set(later)
	l.moment(2)
	l.moment(3)
	for _, c := range []struct {
		at   float64
		want float64
	}{{0, 440}, {1.99, 440}, {2, 415}, {10, 415}} {
		if got := l.in(c.at).A4; got != c.want {
			t.Errorf("at %.2f s: A4 = %g, want %g", c.at, got, c.want)
		}
	}
	l.forget(2.5)
	if got := l.in(2.5).A4; got != 415 || len(l.at) != 1 {
		t.Errorf("after forgetting before 2.5 s: A4 = %g with %d changes kept, want 415 and 1", got, len(l.at))
	}
}
