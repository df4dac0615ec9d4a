package sf2

import (
	"bytes"
	"os"
	"strings"
	"testing"
)

// fluid-soundfont-gm (Debian) installs the FluidR3 General MIDI font here.
const fluidR3 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"

func openFluid(t *testing.T) *Font {
	t.Helper()
	fh, err := os.Open(fluidR3)
	if err != nil {
		t.Fatalf("FluidR3 SoundFont missing (Debian package fluid-soundfont-gm): %v", err)
	}
	t.Cleanup(func() { fh.Close() })
	st, err := fh.Stat()
	if err != nil {
		t.Fatal(err)
	}
	f, err := Open(fh, st.Size())
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func TestFluidR3HeadersAreSane(t *testing.T) {
	f := openFluid(t)
	if len(f.Samples) < 100 || len(f.Instruments) < 100 {
		t.Fatalf("%d samples, %d instruments: too few for a General MIDI font", len(f.Samples), len(f.Instruments))
	}
	loops := 0
	for _, s := range f.Samples {
		if s.Start > s.End || (s.LoopEnd > 0 && (s.LoopStart < s.Start || s.LoopEnd > s.End)) {
			t.Errorf("sample %q: loop %d..%d outside %d..%d", s.Name, s.LoopStart, s.LoopEnd, s.Start, s.End)
		}
		if _, _, ok := s.LoopTruth(); ok {
			loops++
		}
	}
	if loops < len(f.Samples)/2 {
		t.Errorf("only %d of %d samples have usable loops", loops, len(f.Samples))
	}
	found := false
	for _, in := range f.Instruments {
		if strings.Contains(strings.ToLower(in.Name), "clarinet") && len(in.Samples) > 0 {
			found = true
		}
	}
	if !found {
		t.Error("no clarinet instrument with samples")
	}
	x, err := f.Frames(f.Samples[0].Start, f.Samples[0].Start+100)
	if err != nil || len(x) != 100 {
		t.Fatalf("Frames: %v, %d", err, len(x))
	}
}

func TestLoopTruthIsWholeCyclesPerLoop(t *testing.T) {
	// A 441-frame loop at 44100 Hz whose header says A4 (440 Hz nominal):
	// k = round(441·440/44100) = 4.4 → 4, truth 4·44100/441 = 400 Hz.
	s := Sample{LoopStart: 1000, LoopEnd: 1441, Rate: 44100, OriginalPitch: 69}
	hz, k, ok := s.LoopTruth()
	if !ok || k != 4 || hz != 400 {
		t.Errorf("LoopTruth = %v, %d, %v; want 400, 4, true", hz, k, ok)
	}
}

func FuzzOpen(f *testing.F) {
	f.Add([]byte("RIFF\x04\x00\x00\x00sfbk"))
	f.Add([]byte("RIFF\x30\x00\x00\x00sfbkLIST\x10\x00\x00\x00sdtasmpl\x04\x00\x00\x00\x01\x00\x02\x00LIST\x04\x00\x00\x00pdta"))
	f.Fuzz(func(t *testing.T, b []byte) {
		font, err := Open(bytes.NewReader(b), int64(len(b)))
		if err != nil {
			return
		}
		for _, s := range font.Samples {
			font.Frames(s.Start, s.End)
			s.LoopTruth()
		}
	})
}
