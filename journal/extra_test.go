package journal

import (
	"math"
	"path/filepath"
	"strings"
	"testing"

	"fifthline/target"
)

// A voice's note carries its voice; a chord heard is written after its
// notes as one membership row per member, and both read back: the note
// rows unchanged, the membership rows with chord, member and cents from
// just. The chord: C major over C3 with the third E4 6 ¢ above 5/4 (just
// ratios: common practice; ISO 16 equal temperament at A4 = 440 Hz).
func TestVoicesAndChordMembershipsInTheJournal(t *testing.T) {
	tu := target.Default()
	c3 := 440 * math.Exp2(-21.0/12)
	e4 := c3 * 5 / 2 * math.Exp2(6.0/1200)
	hc, ok := tu.NameChord([]float64{c3, e4}, target.DefaultSeventh)
	if !ok {
		t.Fatal("C3 and E4 name no chord")
	}
	path := filepath.Join(t.TempDir(), "j.csv")
	w, err := Open(path, Meta{Session: "s1", Now: (&clock{opening}).now})
	if err != nil {
		t.Fatal(err)
	}
	start := opening.Add(-10 * 60e9) // the take began ten minutes before
	note := heldAt(-2100, 0.5, 2.5, "take.wav")
	w.WriteExtra(note, Extra{Voice: "1"}, start)
	for _, m := range hc.Members {
		ev, x := Membership("take.wav", "", tu, 0.6, 2.4, hc, m)
		if err := w.WriteExtra(ev, x, start); err != nil {
			t.Fatal(err)
		}
	}
	// The meter's journal line counts the chord as a chord, not its
	// membership rows as notes.
	if s := w.Status(); s != "journal: 1 note, 1 chord → "+path {
		t.Errorf("Status %q", s)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	es, warns, err := ReadFile(path)
	if err != nil || len(warns) != 0 || len(es) != 3 {
		t.Fatalf("%d entries, %q, %v", len(es), warns, err)
	}
	if es[0].Voice != "1" || es[0].HeardChord != "" || es[0].Note.String() != "C3" {
		t.Errorf("note row read as %+v", es[0])
	}
	if root := es[1]; !root.Reference || root.Member != "root" {
		t.Errorf("the lowest root, the chord's reference, read as %+v", root)
	}
	third := es[2]
	if third.HeardChord != "C major" || third.Member != "third" || third.Note.String() != "E4" ||
		math.Abs(third.JustCents-6) > 0.005 || math.Abs(third.Cents-(6-13.69)) > 0.01 || third.Start != 0.6 ||
		!third.Time.Equal(start.Add(600e6)) {
		// 5/4 is 386.31 ¢, 13.69 ¢ below the equal third (common practice).
		t.Errorf("third's membership read as %+v", third)
	}
}

// A player's note carries the channel they sit on (counted from 1), and a
// row without one reads back as 0: report seats players by it.
func TestAPlayersChannelInTheJournal(t *testing.T) {
	path := filepath.Join(t.TempDir(), "j.csv")
	w, err := Open(path, Meta{Session: "s1", Now: (&clock{opening}).now})
	if err != nil {
		t.Fatal(err)
	}
	vla := heldAt(-900, 0.5, 1.5, "take.wav")
	vla.Player = "vla"
	w.WriteExtra(vla, Extra{Channel: 2}, opening)
	w.WriteExtra(heldAt(0, 2, 3, "take.wav"), Extra{}, opening)
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	es, warns, err := ReadFile(path)
	if err != nil || len(warns) != 0 || len(es) != 2 {
		t.Fatalf("%d entries, %q, %v", len(es), warns, err)
	}
	if es[0].Player != "vla" || es[0].Channel != 2 || es[1].Channel != 0 {
		t.Errorf("channels read back as %d (%s) and %d, want 2 (vla) and 0", es[0].Channel, es[0].Player, es[1].Channel)
	}
}

// Each membership row says the just ratio its member was judged against,
// so a later report can tell which sevenths were judged: a G dominant
// seventh read with --seventh 7/4 (the harmonic seventh) writes 7/4 on its
// seventh, 5/4 on its third, 3/2 on its fifth and 1/1 on its root (just
// ratios: common practice). A stray ratio is refused.
func TestAMembershipRowNamesItsJustRatio(t *testing.T) {
	tu := target.Default()
	g3 := 440 * math.Exp2(-14.0/12) // ISO 16 equal temperament at A4 = 440 Hz
	hz := []float64{g3, g3 * 5 / 4, g3 * 3 / 2, g3 * 7 / 4}
	hc, ok := tu.NameChord(hz, 7.0/4)
	if !ok || hc.Name() != "G dominant seventh" {
		t.Fatalf("G B D F named %q, %v", hc.Name(), ok)
	}
	es := written(t, Meta{Session: "s1", Now: (&clock{opening}).now}, 4, func(w *Writer) error {
		for _, m := range hc.Members {
			ev, x := Membership("take.wav", "", tu, 0.6, 2.4, hc, m)
			if err := w.WriteExtra(ev, x, opening); err != nil {
				return err
			}
		}
		return nil
	})
	want := map[string]string{"root": "1/1", "third": "5/4", "fifth": "3/2", "seventh": "7/4"}
	for _, e := range es {
		if e.JustRatio != want[e.Member] {
			t.Errorf("%s judged against %q, want %q", e.Member, e.JustRatio, want[e.Member])
		}
		if e.Member == "seventh" && math.Abs(e.JustCents) > 0.01 {
			t.Errorf("a 7/4 seventh read %.2f ¢ from 7/4", e.JustCents)
		}
	}
	_, warns, _ := Read(strings.NewReader(headerLine()+strings.TrimSuffix(sampleLine, ",,tonic")+",9:8,tonic\n"), "j")
	if len(warns) != 1 || !strings.Contains(warns[0], `just_ratio "9:8"`) {
		t.Errorf("a stray ratio on a note row: %q", warns)
	}
}
