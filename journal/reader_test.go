package journal

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const sampleLine = `2026-03-14T19:30:01.750+01:00,s1,mic,Ann,D minor,meantone:1/4,415,,,1.250,2.500,C#5,527.0000,527.5000,-1.64,Db5,40.00,false,false,1.50,22.0,5.50,,,,,,,tonic`

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
		e.Spread != 1.5 || e.VibratoWidth != 22 || e.VibratoRate != 5.5 || e.Anchor != "tonic" {
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
		{"garbage", write("garbage.csv", "\x00\x01PK\x03\x04 binary\n\xff\xfe"), "its first line is not text, so not the journal header"},
		// The WAV given instead of its journal: RIFF is the WAV file's first
		// four bytes (Microsoft RIFF/WAVE; RF64 is its 64-bit form, EBU Tech 3306).
		{"a recording", write("take.wav", "RIFF\x24\x08\x00\x00WAVEfmt \x10\x00"), "it is a WAV recording: read it with analyze, whose --log JOURNAL"},
		{"a text file", write("notes.txt", "shopping list\n"), `its first line "shopping list" is not the journal header`},
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
