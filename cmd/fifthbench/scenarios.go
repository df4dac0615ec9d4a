package main

import (
	"encoding/binary"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
)

// kind says what a clip measures.
type kind int

const (
	steady   kind = iota // exact truth every frame
	rendered             // fluidsynth render: truth good to a few cents, for gross errors
	vibrato              // truth is the vibrato centre
	interval             // one of a pair of exact shifts of one recording
	noise                // no pitch anywhere
	onset                // a note after silence: time to first reading
	crb                  // tone in white noise with a known Cramér–Rao bound
	long                 // one long clip: throughput without per-file start-up
)

// clip is one test signal with its truth.
type clip struct {
	name    string
	kind    kind
	rate    float64
	x       []float32
	hz      float64 // truth: fundamental, vibrato centre
	vibRate float64 // Hz, vibrato clips
	start   float64 // seconds: onset of the note (onset clips)
	pair    int     // interval clips: pair number; two clips share it
	loopSec float64 // interval clips: loop duration, for means over whole loops
	crbHz   float64 // crb clips: Cramér–Rao bound, standard deviation in Hz
	path    string  // WAV written for aubio
}

const fluidR3 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"

// twelveTET is equal temperament from A4 = 440 Hz (ISO 16), key 69 (MIDI 1.0).
func twelveTET(key float64) float64 { return 440 * math.Pow(2, (key-69)/12) }

func buildClips(soxPath, fluidPath, tmp string) ([]clip, error) {
	var cs []clip
	add := func(c clip) { cs = append(cs, c) }
	// Steady synthetic tones over the range, all spectra, three rates.
	for _, rate := range []float64{44100, 48000, 96000} {
		for _, s := range testsignal.All {
			for _, key := range []float64{21, 33, 40, 48, 57, 64, 69, 76, 88, 100, 108} { // A0 … C8
				hz := twelveTET(key)
				x := testsignal.Tone(rate, int(rate*0.4), s, 0.5, testsignal.Steady(hz))
				add(clip{name: fmt.Sprintf("%s %.2f Hz @%g", s.Name, hz, rate), kind: steady, rate: rate, x: testsignal.Float32(x), hz: hz})
			}
		}
	}
	// sox synth tones at stated frequencies.
	for _, t := range []struct {
		wave string
		rate float64
		hz   float64
	}{{"sine", 44100, 27.5}, {"sine", 44100, 440}, {"sine", 48000, 261.6256}, {"sine", 96000, 4186.009},
		{"triangle", 44100, 110}, {"triangle", 48000, 659.2551}, {"triangle", 96000, 55}} {
		x, err := soxSynth(soxPath, t.rate, t.wave, t.hz, 0.6)
		if err != nil {
			return nil, err
		}
		add(clip{name: fmt.Sprintf("sox %s %g Hz", t.wave, t.hz), kind: steady, rate: t.rate, x: x, hz: t.hz})
	}
	// FluidR3 short loops: one waveform over and over, exact truth.
	font, fh, err := sf2.OpenFile(fluidR3)
	if err != nil {
		return nil, fmt.Errorf("FluidR3 SoundFont (Debian package fluid-soundfont-gm): %w", err)
	}
	defer fh.Close()
	loops, err := font.Loops([]string{"Cello", "Viola", "Violin", "Contrabass", "Clarinet", "Oboe", "Bassoon",
		"Tenor Sax", "Trumpet", "Trombone", "Tuba", "French Horns", "Ohh Voices", "Recorder"}, 4, 2048)
	if err != nil {
		return nil, err
	}
	for _, l := range loops {
		x := testsignal.Repeat(l.Frames, int(l.Rate*0.6))
		testsignal.Normalize(x, 0.5)
		add(clip{name: "FluidR3 loop " + l.Sample, kind: steady, rate: l.Rate, x: testsignal.Float32(x), hz: l.Hz})
	}
	// Interval: two exact shifts of one recording (a loop reperiodised to
	// two new lengths); the truth is 1200·log2(L1/L2).
	pair := 0
	for _, l := range loops {
		if pair == 8 {
			break
		}
		n := len(l.Frames)
		l1 := int(math.Round(float64(n) * math.Pow(2, 70.0/1200)))  // about 70 ¢ down
		l2 := int(math.Round(float64(n) * math.Pow(2, -45.0/1200))) // about 45 ¢ up
		for _, ln := range []int{l1, l2} {
			y := testsignal.Repeat(testsignal.Reperiod(l.Frames, ln), int(l.Rate*0.8))
			testsignal.Normalize(y, 0.5)
			add(clip{name: fmt.Sprintf("shift %s to %d", l.Sample, ln), kind: interval, rate: l.Rate,
				x: testsignal.Float32(y), hz: l.Hz * float64(n) / float64(ln), pair: pair, loopSec: float64(ln) / l.Rate})
		}
		pair++
	}
	// Vibrato 5–25 cents at 4.5–6.5 Hz.
	for _, w := range []float64{5, 15, 25} {
		for _, vr := range []float64{4.5, 5.5, 6.5} {
			for _, s := range []testsignal.Spectrum{testsignal.Saw, testsignal.OddOnly} {
				hz := 392.0
				x := testsignal.Tone(48000, 48000*2, s, 0.5, testsignal.Vibrato(hz, w, vr))
				add(clip{name: fmt.Sprintf("vibrato %g¢ %gHz %s", w, vr, s.Name), kind: vibrato, rate: 48000, x: testsignal.Float32(x), hz: hz, vibRate: vr})
			}
		}
	}
	// Noise, breath and silence: no pitch.
	r := rand.New(rand.NewPCG(2026, 12))
	n := 44100 * 2
	for _, c := range []struct {
		name string
		x    []float64
	}{{"white noise", testsignal.White(r, n)}, {"pink noise", testsignal.Pink(r, n)},
		{"breath 300 Hz", testsignal.Breath(r, n, 44100, 300, 4)}, {"breath 1 kHz", testsignal.Breath(r, n, 44100, 1000, 4)},
		{"breath 2.5 kHz", testsignal.Breath(r, n, 44100, 2500, 4)}, {"silence", make([]float64, n)}} {
		testsignal.Normalize(c.x, 0.3)
		add(clip{name: c.name, kind: noise, rate: 44100, x: testsignal.Float32(c.x)})
	}
	// Onsets after silence, notes above 80 Hz, 5 ms attack.
	for _, key := range []float64{40, 45, 57, 69, 81} { // E2 … A5
		for _, s := range []testsignal.Spectrum{testsignal.Saw, testsignal.WeakFund} {
			hz := twelveTET(key)
			x := make([]float64, 48000*8/10)
			tone := testsignal.Tone(48000, len(x)-48000*3/10, s, 0.3, testsignal.Steady(hz))
			testsignal.FadeIn(tone, 48000, 0.005)
			copy(x[48000*3/10:], tone)
			add(clip{name: fmt.Sprintf("onset %.1f Hz %s", hz, s.Name), kind: onset, rate: 48000, x: testsignal.Float32(x), hz: hz, start: 0.3})
		}
	}
	// Tones in white noise with their Cramér–Rao bound.
	for _, snr := range []float64{20, 30, 40} {
		for _, hz := range []float64{220, 440, 880} {
			x := testsignal.Tone(44100, 44100*2, testsignal.Saw, 0.5, testsignal.Steady(hz))
			rms := testsignal.RMS(x)
			sigma := testsignal.AddNoise(x, testsignal.White(r, len(x)), snr)
			amps := scaledAmps(testsignal.Saw, hz, 44100, rms)
			add(clip{name: fmt.Sprintf("saw %g Hz %g dB", hz, snr), kind: crb, rate: 44100, x: testsignal.Float32(x), hz: hz,
				crbHz: testsignal.CramerRaoHz(44100, 4608, amps, hz, sigma)})
		}
	}
	// One long clip, so aubio's process start-up and file opening weigh
	// little in its CPU time.
	x := testsignal.Tone(44100, 44100*20, testsignal.Saw, 0.5, testsignal.Vibrato(220, 10, 5))
	add(clip{name: "long saw 220 Hz", kind: long, rate: 44100, x: testsignal.Float32(x), hz: 220, vibRate: 5})
	// fluidsynth renders of low, weak-fundamental and odd-spectrum notes.
	rend, err := fluidRenders(fluidPath, tmp)
	if err != nil {
		return nil, err
	}
	return append(cs, rend...), nil
}

// scaledAmps returns the partial amplitudes actually in a tone of spectrum
// s whose RMS is rms (partials above 0.45·rate were not rendered).
func scaledAmps(s testsignal.Spectrum, f0, rate, rms float64) []float64 {
	var p float64
	for k, a := range s.Amps {
		if float64(k+1)*f0 <= 0.45*rate {
			p += a * a / 2
		}
	}
	g := rms / math.Sqrt(p)
	out := make([]float64, len(s.Amps))
	for k, a := range s.Amps {
		out[k] = g * a
	}
	return out
}

func soxSynth(sox string, rate float64, wave string, hz, seconds float64) ([]float32, error) {
	out, err := exec.Command(sox, "-n", "-r", strconv.FormatFloat(rate, 'f', -1, 64),
		"-e", "floating-point", "-b", "32", "-c", "1", "-t", "raw", "-",
		"synth", strconv.FormatFloat(seconds, 'f', -1, 64), wave, strconv.FormatFloat(hz, 'f', -1, 64),
		"gain", "-6").Output()
	if err != nil {
		return nil, fmt.Errorf("sox synth %s %g: %w", wave, hz, err)
	}
	return rawFloats(out, 1), nil
}

// rawFloats decodes little-endian float32 frames, keeping channel 0.
func rawFloats(b []byte, channels int) []float32 {
	x := make([]float32, len(b)/4/channels)
	for i := range x {
		x[i] = math.Float32frombits(binary.LittleEndian.Uint32(b[4*channels*i:]))
	}
	return x
}

// fluidRenders renders held notes with fluidsynth from FluidR3: General MIDI
// programs (0-based) for instruments whose low notes have weak fundamentals
// or odd-only spectra. Its tuning is good to about a cent, so these clips
// count only gross (octave, fifth) errors.
func fluidRenders(fluid, tmp string) ([]clip, error) {
	var cs []clip
	for _, n := range []struct {
		name         string
		program, key int
	}{{"bassoon", 70, 34}, {"bassoon", 70, 41}, {"cello", 42, 36}, {"cello", 42, 43}, {"contrabass", 43, 28},
		{"tuba", 58, 29}, {"tuba", 58, 34}, {"trombone", 57, 40}, {"clarinet", 71, 50}, {"clarinet", 71, 55},
		{"oboe", 68, 62}, {"trumpet", 56, 58}, {"french horn", 60, 41}, {"choir aahs", 52, 48}, {"violin", 40, 55}} {
		mid := filepath.Join(tmp, fmt.Sprintf("note-%d-%d.mid", n.program, n.key))
		raw := mid + ".raw"
		if err := os.WriteFile(mid, testsignal.MIDI(n.program, []testsignal.MIDINote{{Key: n.key, Seconds: 1.2}}), 0o644); err != nil {
			return nil, err
		}
		// No chorus or reverb: their modulated copies would blur the pitch.
		cmd := exec.Command(fluid, "-ni", "-q", "-C0", "-R0", "-g", "0.5", "-r", "44100", "-T", "raw", "-O", "float", "-F", raw, fluidR3, mid)
		if out, err := cmd.CombinedOutput(); err != nil {
			return nil, fmt.Errorf("fluidsynth %s: %v: %s", n.name, err, out)
		}
		b, err := os.ReadFile(raw)
		if err != nil {
			return nil, err
		}
		x := rawFloats(b, 2)
		// Keep the held part: 0.15 s after the note-on to its note-off.
		x = x[min(len(x), 44100*15/100):min(len(x), 44100*12/10)]
		cs = append(cs, clip{name: fmt.Sprintf("fluidsynth %s key %d", n.name, n.key), kind: rendered, rate: 44100, x: x, hz: twelveTET(float64(n.key))})
	}
	return cs, nil
}
