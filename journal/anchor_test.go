package journal

import (
	"math"
	"strings"
	"testing"

	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// The contract's --a4 row: just intonation keeps the tonic where equal
// temperament at the reference puts it unless --anchor a4 says otherwise,
// so the same G4 held in just C major at A4 = 440 Hz reads against two
// targets 15.64 ¢ apart (A4 in just C major is 5/3 above C, 884.36 ¢, not
// 900: held at 440 Hz it raises C and every target by 15.64 ¢; handbook),
// and a4, key and temperament alone do not tell them apart.
// The journal says which anchor each row was read with; a journal older
// than the anchor column reads as the temperament's own then (tonic in
// just, a4 otherwise).
func TestTheJournalSaysWhichAnchorEachNoteWasReadWith(t *testing.T) {
	just, err := target.ParseTemperament("just")
	if err != nil {
		t.Fatal(err)
	}
	hz := 440 * math.Exp2(-200.0/1200) // G4 in equal temperament (ISO 16)
	es := written(t, Meta{Player: "Ann", Now: (&clock{opening}).now}, 2, func(w *Writer) error {
		for _, anchor := range []target.Anchor{target.AnchorDefault, target.AnchorA4} {
			tu := target.Default()
			tu.Temperament, tu.Anchor = just, anchor
			ev := session.Event{Source: "mic", Held: pitchdetect.Held{Start: 1, End: 2, Hz: hz, Frames: 40}, Reading: tu.Classify(hz), Tuning: tu}
			if err := w.Write(ev); err != nil {
				return err
			}
		}
		return nil
	})
	if es[0].Anchor != "tonic" || es[1].Anchor != "a4" {
		t.Errorf("anchors %q and %q, want tonic (just's own) and a4 (--anchor a4)", es[0].Anchor, es[1].Anchor)
	}
	if d := es[0].Cents - es[1].Cents; math.Abs(d-15.64) > 0.01 {
		t.Errorf("the G4 read %.2f ¢ higher tonic-anchored than A4-anchored, want 15.64 (900 − 884.36 ¢)", d)
	}
	old := olderHeaderLine() + olderSampleLine() + "\n" +
		olderHeaderLine() + strings.Replace(olderSampleLine(), "meantone:1/4", "just", 1) + "\n"
	es, warns, err := Read(strings.NewReader(old), "old.csv")
	if err != nil || len(warns) != 0 || len(es) != 2 {
		t.Fatalf("old journal: %d entries, %q, %v", len(es), warns, err)
	}
	if es[0].Anchor != "a4" || es[1].Anchor != "tonic" {
		t.Errorf("older journal's anchors %q (meantone) and %q (just), want a4 and tonic", es[0].Anchor, es[1].Anchor)
	}
	if _, warns, _ := Read(strings.NewReader(headerLine()+strings.TrimSuffix(sampleLine, "tonic")+"C4\n"), "j"); len(warns) != 1 || !strings.Contains(warns[0], `anchor "C4"`) {
		t.Errorf("an anchor neither a4 nor tonic: %q", warns)
	}
}
