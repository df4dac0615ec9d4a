package sf2

import (
	"bytes"
	"math"
	"os"
	"strings"
	"testing"

	"fifthline/internal/testsignal"
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
	for _, s := range f.Samples {
		if s.Start > s.End || (s.LoopEnd > 0 && (s.LoopStart < s.Start || s.LoopEnd > s.End)) {
			t.Errorf("sample %q: loop %d..%d outside %d..%d", s.Name, s.LoopStart, s.LoopEnd, s.Start, s.End)
		}
	}
	zones, loops := 0, 0
	found := false
	for _, in := range f.Instruments {
		for _, z := range in.Zones {
			zones++
			if _, _, ok := f.Samples[z.Sample].LoopTruth(f.NominalHz(z)); ok {
				loops++
			}
		}
		if strings.Contains(strings.ToLower(in.Name), "clarinet") && len(in.Zones) > 0 {
			found = true
		}
	}
	if loops < zones/3 {
		t.Errorf("only %d of %d zones have loops of whole cycles", loops, zones)
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
	// A 441-frame loop at 44100 Hz whose header says key 69, A4 (MIDI 1.0 and
	// SoundFont 2.01 key numbers), 440 Hz nominal (ISO 16):
	// k = round(441·440/44100) = 4.4 → 4, truth 4·44100/441 = 400 Hz.
	s := Sample{LoopStart: 1000, LoopEnd: 1441, Rate: 44100, OriginalPitch: 69}
	f := &Font{Samples: []Sample{s}}
	if _, _, ok := s.LoopTruth(f.NominalHz(Zone{RootKey: -1})); ok {
		t.Error("4.4 cycles accepted as a whole number")
	}
	// 4.4 cycles is no whole number; at A4 = 440 Hz and a 451-frame loop,
	// 451·440/44100 = 4.4998: also refused. At 501 frames: 4.999 → 5.
	s.LoopEnd = 1501
	hz, k, ok := s.LoopTruth(440)
	if !ok || k != 5 || hz != 5*44100.0/501 {
		t.Errorf("LoopTruth = %v, %d, %v; want %v, 5, true", hz, k, ok, 5*44100.0/501)
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
		for _, in := range font.Instruments {
			for _, z := range in.Zones {
				s := font.Samples[z.Sample]
				font.Frames(s.Start, s.End)
				s.LoopTruth(font.NominalHz(z))
			}
		}
	})
}

// FluidR3's loops give a harmonic profile for each instrument the ensemble
// takes use, and a profile is the loop's own sound: played at the loop's
// exact fundamental (a whole-cycle clarinet loop, E3), one cycle of it
// matches the loop's average cycle, and its even partials are weak, as a
// clarinet's low register has them (odd partials dominate: Fletcher &
// Rossing, "The Physics of Musical Instruments", from memory).
func TestTimbresAreTheLoopsOwnSpectra(t *testing.T) {
	f := openFluid(t)
	names := []string{"Bassoon", "Clarinet", "Oboe", "Flute", "Cello", "Viola", "Violin", "Ohh Voices"}
	timbres, err := f.Timbres(names, 20000)
	if err != nil {
		t.Fatal(err)
	}
	per := map[string]int{}
	for _, tb := range timbres {
		per[tb.Instrument]++
	}
	for _, n := range names {
		if per[n] == 0 {
			t.Errorf("no profile of FluidR3's %s", n)
		}
	}
	loops, err := f.Loops([]string{"Clarinet"}, 20, 4096)
	if err != nil {
		t.Fatal(err)
	}
	loop, _ := Nearest(loops, 165)
	var tb Timbre
	for _, x := range timbres {
		if x.Sample == loop.Sample {
			tb = x
		}
	}
	if tb.Hz != loop.Hz {
		t.Fatalf("profile of %s at %.3f Hz, its loop at %.3f Hz", loop.Sample, tb.Hz, loop.Hz)
	}
	// The loop's k cycles averaged into one, and one cycle of the profile,
	// both as testsignal.Reperiod lays them on 512 samples.
	avg := make([]float64, 512)
	for i, v := range testsignal.Reperiod(loop.Frames, 512*loop.Cycles) {
		avg[i%512] += v / float64(loop.Cycles)
	}
	one := testsignal.Tone(512*loop.Hz, 512, tb.Spectrum, 1, testsignal.Steady(loop.Hz))
	testsignal.Normalize(avg, 1)
	a := tb.Spectrum.Amps
	var dot, aa, bb float64
	for i := range avg {
		dot, aa, bb = dot+avg[i]*one[i], aa+avg[i]*avg[i], bb+one[i]*one[i]
	}
	r := dot / math.Sqrt(aa*bb)
	t.Logf("%s (%d cycles, %.3f Hz): one cycle of its profile correlates with the loop's average cycle at %.4f; partials 1–4 %.3f", loop.Sample, loop.Cycles, loop.Hz, r, a[:4])
	if r < 0.99 {
		t.Errorf("%s: profile and loop correlate at %.3f", loop.Sample, r)
	}
	if !(a[1] < a[0]/4 && a[3] < a[2]/4) {
		t.Errorf("%s: partials %v; a clarinet's low register has weak even partials", loop.Sample, a[:4])
	}
}
