package tuningfile

import (
	"errors"
	"strings"
	"testing"
)

// A rehearsal folder's file, written as a musician would: the values read
// as the flags spell them (interface contract, "Musical flags").
func TestParseReadsTheFlagsWords(t *testing.T) {
	v, err := Parse("fifthline.toml", []byte(`
# our consort
key = "g minor"
temperament = "meantone:1/4"
a4 = 415          # Baroque pitch (common practice)
anchor = "tonic"
transpose = "Bb"
`), nil)
	if err != nil {
		t.Fatal(err)
	}
	want := Values{Key: "G minor", Temperament: "meantone:1/4", A4: "415", Anchor: "tonic", Transpose: "Bb"}
	if v != want {
		t.Errorf("got %+v, want %+v", v, want)
	}
}

func TestA4MayBeANumberOrAString(t *testing.T) {
	for _, text := range []string{`a4 = 415.3`, `a4 = "415.3"`} {
		v, err := Parse("f", []byte(text), nil)
		if err != nil || v.A4 != "415.3" {
			t.Errorf("%s: %+v, %v", text, v, err)
		}
	}
}

// Every mistake names the file and the line, in one line.
func TestErrorsNameTheFileAndLine(t *testing.T) {
	for _, tc := range []struct{ text, want string }{
		{"key = \"G major\"\n\nkey = \"H\"\n", "f.toml line 3"},      // set twice
		{"key = \"G major\"\na4 = -440\n", "f.toml line 2"},          // the contract's out-of-range --a4
		{"temperament = \"meantone:1/0\"\n", "f.toml line 1"},        // the contract's unreadable temperament
		{"\n\nkey = \"H\"\n", "f.toml line 3"},                       // no such tonic (contract: --key H)
		{"key = G major\n", "f.toml line 1"},                         // not TOML: a string needs quotes
		{"a4 = 440\ntempo = 60\n", "f.toml line 2: unknown setting"}, // not ours
		{"a4 = 440\n[players]\nvc = \"Ann\"\n", "f.toml line 2"},     // a table we do not read
		{"anchor = \"bass\"\n", "f.toml line 1"},                     // a4 or tonic only
		{"transpose = \"Q\"\n", "f.toml line 1"},                     // no such note
		{"key = [\"G major\"]\n", "f.toml line 1"},                   // wrong TOML type
		{"temperament = \"chapel.tmp\"\n", "f.toml line 1"},          // a file, refused without a checker
	} {
		_, err := Parse("f.toml", []byte(tc.text), nil)
		if err == nil || !strings.HasPrefix(err.Error(), tc.want) || strings.Contains(err.Error(), "\n") {
			t.Errorf("%q: error %v, want it to start %q and be one line", tc.text, err, tc.want)
		}
	}
}

func TestATemperamentFileIsAskedAbout(t *testing.T) {
	asked := ""
	v, err := Parse("f", []byte(`temperament = "chapel.tmp"`), func(spec string) error { asked = spec; return nil })
	if err != nil || asked != "chapel.tmp" || v.Temperament != "chapel.tmp" {
		t.Errorf("%+v, %v, asked %q", v, err, asked)
	}
	_, err = Parse("f", []byte("\ntemperament = \"chapel.tmp\""), func(string) error { return errors.New("no such file") })
	if err == nil || !strings.Contains(err.Error(), "line 2") || !strings.Contains(err.Error(), "no such file") {
		t.Errorf("error %v", err)
	}
}

func TestEncodeReadsBack(t *testing.T) {
	for _, v := range []Values{
		{Key: "G major", Temperament: "meantone:1/4", A4: "415.2"},
		{A4: "440"},
		{Key: "F# minor", Temperament: "edo:31", A4: "442", Anchor: "tonic", Transpose: "Eb4"},
		{},
	} {
		back, err := Parse("f", Encode(v), nil)
		if err != nil || back != v {
			t.Errorf("%+v → %q → %+v, %v", v, Encode(v), back, err)
		}
	}
}

// The reader never panics, and what it accepts writes back the same.
func FuzzParse(f *testing.F) {
	for _, s := range []string{
		"key = \"G major\"\na4 = 415\n", "temperament = \"meantone:1/4\"", "a4 = 1e400", "a4 = nan",
		"[x]\ny = 1", "key = \"\"", "transpose = \"concert\"", "a4 = 0x1b3", "anchor = 'tonic'\n\"key\" = 'D dorian'",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		v, err := Parse("f", data, nil)
		if err != nil {
			if strings.Contains(err.Error(), "\n") {
				t.Fatalf("error of more than one line: %q", err)
			}
			return
		}
		back, err := Parse("f", Encode(v), nil)
		if err != nil || back != v {
			t.Fatalf("%+v → %q → %+v, %v", v, Encode(v), back, err)
		}
	})
}
