package journal

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const sampleLine = `2026-03-14T19:30:01.750+01:00,s1,mic,Ann,D minor,meantone:1/4,415,,,1.250,2.500,C#5,527.0000,527.5000,-1.64,Db5,40.00,false,1.50,22.0,5.50`

func TestReadParsesEveryColumn(t *testing.T) {
	entries, warns, err := Read(strings.NewReader(headerLine()+sampleLine+"\n"), "j")
	if err != nil || len(warns) != 0 || len(entries) != 1 {
		t.Fatalf("%d entries, %q, %v", len(entries), warns, err)
	}
	e := entries[0]
	if e.Time.Format(TimeLayout) != "2026-03-14T19:30:01.750+01:00" || e.Session != "s1" || e.Source != "mic" ||
		e.Player != "Ann" || e.Key != "D minor" || e.Temperament != "meantone:1/4" || e.A4 != 415 ||
		e.Start != 1.25 || e.End != 2.5 || e.Note.String() != "C#5" || e.Alt.String() != "Db5" ||
		e.Hz != 527 || e.TargetHz != 527.5 || e.Cents != -1.64 || e.AltCents != 40 || e.SamePitch ||
		e.Spread != 1.5 || e.VibratoWidth != 22 || e.VibratoRate != 5.5 {
		t.Errorf("entry %+v", e)
	}
}

func TestReadSkipsDamagedLinesWithAWarning(t *testing.T) {
	body := headerLine() + sampleLine + "\n" +
		"\n" + // blank: quiet
		headerLine() + // journals joined with cat: quiet
		strings.Replace(sampleLine, "-1.64", "lots", 1) + "\n" +
		strings.Replace(sampleLine, "C#5", "H5", 1) + "\r\n" +
		sampleLine + "\r\n" + // saved back by a spreadsheet with CRLF
		sampleLine[:60] // torn by a crash
	entries, warns, err := Read(strings.NewReader(body), "j.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 2 {
		t.Errorf("%d entries, want 2", len(entries))
	}
	want := []string{
		`journal j.csv line 5: cents "lots" is not a number; skipped`,
		`journal j.csv line 6: note: `,
		`journal j.csv line 8: incomplete last line (a session cut short?); skipped`,
	}
	if len(warns) != len(want) {
		t.Fatalf("warnings %q, want %d", warns, len(want))
	}
	for i := range want {
		if !strings.HasPrefix(warns[i], want[i]) {
			t.Errorf("warning %q, want it to start %q", warns[i], want[i])
		}
	}
}

func TestReadRefusesWhatIsNotAJournal(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		os.WriteFile(p, []byte(body), 0o644)
		return p
	}
	cases := []struct{ name, path, want string }{
		{"missing file", filepath.Join(dir, "none.csv"), "no such file"},
		{"a folder", dir, "is a folder"},
		{"empty", write("empty.csv", ""), "is empty"},
		{"only blank lines", write("blank.csv", "\n \n"), "is empty"},
		{"analyze output, not a journal", write("analyze.csv", "start_s,end_s,note,hz,target_hz,cents,alt_note,alt_cents\n"), "columns missing: time, session"},
		{"garbage", write("garbage.csv", "\x00\x01PK\x03\x04 binary\n\xff\xfe"), "is not the journal header"},
		{"unbalanced quote", write("quote.csv", "\"time,session\n"), "first line is not a header"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, _, err := ReadFile(c.path)
			if err == nil || !strings.Contains(err.Error(), c.want) || strings.Contains(err.Error(), "\n") {
				t.Errorf("error %v, want one line containing %q", err, c.want)
			}
		})
	}
}

func TestReadCapsWarnings(t *testing.T) {
	body := headerLine() + strings.Repeat("junk\n", 25)
	_, warns, err := Read(strings.NewReader(body), "j")
	if err != nil || len(warns) != maxWarnings+1 || !strings.Contains(warns[maxWarnings], "15 more") {
		t.Errorf("%d warnings (last %q), %v", len(warns), warns[len(warns)-1], err)
	}
}

// The contract's rule (interface.md, Alternative spelling): a note sits on
// the other spelling only when nearer the alternative's target and within a
// quarter of the gap between the two targets.
func TestOnOtherSpellingFollowsTheQuarterGapRule(t *testing.T) {
	cases := []struct {
		name            string
		cents, altCents float64
		want            bool
	}{
		// ¼-comma meantone: G♭ lies 41.06 ¢ above F♯ (the lesser diesis
		// 128/125, handbook value); an F♯5 played 38 ¢ high is 3 ¢ below G♭5.
		{"quarter-comma F# on Gb", 38, -3.06, true},
		// ⅙-comma: the fifth is 701.955 − 21.506/6 = 698.371 ¢, and 12 such
		// fifths fall 19.55 ¢ short of 7 octaves, the gap (hand-computed from
		// the definition); an F♯ pushed up 11 ¢ is 8.55 ¢ below G♭ — nearer
		// it, but past a quarter of the gap (4.9 ¢).
		{"sixth-comma leading tone pushed up", 11, -8.55, false},
		{"sixth-comma on the Gb", 16, -3.55, true},
		// Pythagorean: G♭ lies a Pythagorean comma (23.46 ¢) below F♯; an F♯
		// 12 ¢ low is 11.46 ¢ above G♭ — nearer, not within 5.9 ¢.
		{"pythagorean F# 12 low", -12, 11.46, false},
		{"in tune", 2, 43.06, false},
		{"both spellings share a pitch (equal temperament)", 3, 3, false},
	}
	for _, c := range cases {
		if got := OnOtherSpelling(c.cents, c.altCents); got != c.want {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
}

// A journal from before on_other_spelling is judged by the rule from its own
// cents and alt_cents; one that carries the column is read as written; a
// note offered no other spelling has empty alt_note and alt_cents.
func TestReadOnOtherSpellingOldAndNew(t *testing.T) {
	// An older journal: F♯5 38 ¢ high, 3.06 ¢ below G♭5 (¼-comma, as above).
	old := strings.Replace(sampleLine, "-1.64,Db5,40.00", "38.00,Gb5,-3.06", 1)
	entries, warns, err := Read(strings.NewReader(headerLine()+old+"\n"), "old")
	if err != nil || len(warns) != 0 || len(entries) != 1 || !entries[0].OnOther || !entries[0].HasAlt {
		t.Fatalf("older journal: %+v %q %v", entries, warns, err)
	}
	withCol := strings.TrimSuffix(headerLine(), "\n") + ",on_other_spelling\n"
	body := withCol + old + ",false\n" + // the writer's verdict stands
		strings.Replace(sampleLine, "Db5,40.00", ",", 1) + ",false\n" // G-like: no other spelling offered
	entries, warns, err = Read(strings.NewReader(body), "new")
	if err != nil || len(warns) != 0 || len(entries) != 2 {
		t.Fatalf("newer journal: %d entries %q %v", len(entries), warns, err)
	}
	if entries[0].OnOther || entries[1].HasAlt || entries[1].OnOther {
		t.Errorf("entries %+v", entries)
	}
	if _, warns, _ := Read(strings.NewReader(withCol+strings.Replace(sampleLine, "Db5,40.00", ",", 1)+",true\n"), "bad"); len(warns) != 1 {
		t.Errorf("on another spelling that does not exist: warnings %q", warns)
	}
}
