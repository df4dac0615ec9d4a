package voiceframes

import (
	"bytes"
	"os"
	"reflect"
	"strings"
	"testing"
)

// The fixtures in the repository are exactly as Format writes what Parse
// reads from them, so a fixture written again from the same frames does
// not change.
func TestTheFixturesAreAsFormatWritesThem(t *testing.T) {
	for _, path := range []string{"../../ui/testdata/open-voicing-frames.csv", "../../cmd/fifthline/testdata/open-voicing-heard.csv"} {
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		frames, err := Read(path)
		if err != nil {
			t.Fatal(err)
		}
		var b bytes.Buffer
		if err := Format(&b, frames); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(b.Bytes(), data) {
			t.Errorf("%s: %d frames written again differ from the file", path, len(frames))
		}
	}
}

// A line is a time, a span and three fields a voice: pitch, level, marks
// (m marked on a lower voice's partials, p taken for them).
func TestALineIsAFrame(t *testing.T) {
	frames, err := Parse(strings.NewReader("0.1858,0.3715,131.627,-27.49,,662.979,-25.73,mp\n0.2786,0.3715\n"))
	if err != nil {
		t.Fatal(err)
	}
	want := []Frame{
		{At: 0.1858, Span: 0.3715, Hz: []float64{131.627, 662.979}, DB: []float64{-27.49, -25.73}, Marked: []bool{false, true}, Partials: []bool{false, true}},
		{At: 0.2786, Span: 0.3715},
	}
	if !reflect.DeepEqual(frames, want) {
		t.Errorf("got %+v, want %+v", frames, want)
	}
	for _, bad := range []string{"0.1\n", "0.1,0.3,131.6,-27\n", "0.1,0.3,x,-27,\n"} {
		if _, err := Parse(strings.NewReader(bad)); err == nil {
			t.Errorf("%q: no error", bad)
		}
	}
}

func FuzzParse(f *testing.F) {
	f.Add([]byte("0.1858,0.3715,131.627,-27.49,,662.979,-25.73,mp\n"))
	f.Add([]byte("0.2786,0.3715\n1,2,3,4,p\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		frames, err := Parse(bytes.NewReader(data))
		if err != nil {
			return
		}
		// Once written, frames read back write the same again.
		var once, twice bytes.Buffer
		if err := Format(&once, frames); err != nil {
			t.Fatal(err)
		}
		again, err := Parse(bytes.NewReader(once.Bytes()))
		if err != nil {
			t.Fatalf("%q written as %q: %v", data, once.String(), err)
		}
		if err := Format(&twice, again); err != nil {
			t.Fatal(err)
		}
		if once.String() != twice.String() {
			t.Errorf("%q written as %q, then as %q", data, once.String(), twice.String())
		}
	})
}
