package journal

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// olderHeader is the journal header before on_other_spelling was added.
func olderHeaderLine() string {
	return strings.Join(slices.DeleteFunc(Header(), func(c string) bool { return Later[c] }), ",") + "\n"
}

// olderSampleLine is sampleLine as a journal before the Later columns held
// it.
func olderSampleLine() string {
	return strings.TrimSuffix(strings.Replace(sampleLine, ",false,false,", ",false,", 1), ",,,,,,,tonic")
}

// A journal written before the on_other_spelling column is still read (the
// column unknown, not false), and appending to it puts a fresh header above
// the new rows, so that both kinds of row read back.
func TestJournalsOlderThanTheOnOtherSpellingColumn(t *testing.T) {
	old := olderSampleLine()
	path := filepath.Join(t.TempDir(), "old.csv")
	if err := os.WriteFile(path, []byte(olderHeaderLine()+old+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	es, warns, err := ReadFile(path)
	if err != nil || len(warns) != 0 || len(es) != 1 || es[0].OnOtherKnown || es[0].Alt.String() != "Db5" {
		t.Fatalf("old journal: %+v, %q, %v", es, warns, err)
	}
	w, err := Open(path, Meta{Player: "Ann", Now: (&clock{opening}).now})
	if err != nil {
		t.Fatal(err)
	}
	// A4 +10 ¢ (ISO 16's 440 Hz, the definition of the cent): no other
	// spelling offered, so it sits on none.
	if err := w.Write(heldAt(10, 1, 2, "mic")); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	es, warns, err = ReadFile(path)
	if err != nil || len(warns) != 0 || len(es) != 2 {
		t.Fatalf("appended journal: %d entries, %q, %v", len(es), warns, err)
	}
	if !es[1].OnOtherKnown || es[1].OnOther || es[1].HasAlt || es[1].Note.String() != "A4" {
		t.Errorf("new row read as %+v", es[1])
	}
}
