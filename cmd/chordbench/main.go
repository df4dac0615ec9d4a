// Command chordbench measures the multipitch estimator on chords mixed onto
// one channel with known truth — synthetic voices and FluidR3 sample loops,
// steady and with vibrato, 35–45 dB SNR — and puts fifthline's single-voice
// detector and aubio (aubiopitch -p yinfft, Debian aubio-tools) beside it on
// the same mixtures: they report one pitch per moment, and the table shows
// how many of the chord's voices they ever find. It prints one Markdown
// table (also written to multipitch/BENCH.md) with accuracy, phantoms,
// misses, the Cramér–Rao bound beside the spread, and speed.
//
// It is a measurement, not a test: it checks no targets and exits 0 whatever
// the numbers. It needs sox, aubio-tools and fluid-soundfont-gm.
package main

import (
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"strings"

	"fifthline/internal/sf2"
	"fifthline/internal/testsignal"
)

const (
	rate    = 44100.0
	seconds = 3.0
	fluidR3 = "/usr/share/sounds/sf2/FluidR3_GM.sf2"
)

// voice is one part of a mixture: its samples, the pitch it should be read
// at, its partial amplitudes as present (for the bound), and whether it has
// vibrato (then only its mean over the take is scored).
type voice struct {
	x       []float64
	hz      float64
	amps    []float64
	vibrato bool
}

// mixture is one scenario: voices summed, noise added.
type mixture struct {
	name   string
	voices []voice
	snr    float64
	x      []float64
	sigma  float64 // noise standard deviation
}

func main() {
	md := flag.String("md", "multipitch/BENCH.md", "also write the table to this Markdown file (empty: don't)")
	flag.Parse()
	if err := run(os.Stdout, *md); err != nil {
		fmt.Fprintln(os.Stderr, "chordbench:", err)
		os.Exit(1)
	}
}

func run(w io.Writer, md string) error {
	mixes, err := mixtures()
	if err != nil {
		return err
	}
	tmp, err := os.MkdirTemp("", "chordbench-")
	if err != nil {
		return err
	}
	defer os.RemoveAll(tmp)
	var b strings.Builder
	b.WriteString(tableHead)
	for i, m := range mixes {
		row, err := measure(m, fmt.Sprintf("%s/mix%02d.wav", tmp, i))
		if err != nil {
			return err
		}
		b.WriteString(row)
	}
	b.WriteString(tableFoot)
	fmt.Fprint(w, b.String())
	if md != "" {
		return os.WriteFile(md, []byte("# Chords from one channel: multipitch beside one-pitch detectors\n\n"+
			"Made by `go run ./cmd/chordbench` (`make bench`).\n\n"+b.String()), 0o644)
	}
	return nil
}

// et is the equal-tempered pitch s semitones from A4 = 440 Hz (ISO 16).
func et(s float64) float64 { return 440 * math.Exp2(s/12) }

func mixtures() ([]mixture, error) {
	n := int(seconds * rate)
	syn := func(s testsignal.Spectrum, hz float64) voice {
		return synth(s, hz, testsignal.Steady(hz), n, false)
	}
	saw, odd, weak, second := testsignal.Saw, testsignal.OddOnly, testsignal.WeakFund, testsignal.StrongSecond
	c3, g3, c4, e4, g4 := et(-21), et(-14), et(-9), et(-5), et(-2)
	a3, b3, d4, f4 := et(-12), et(-10), et(-7), et(-4)
	out := []mixture{
		{name: "just C major, close, saw ×3", snr: 40, voices: []voice{syn(saw, c4), syn(saw, c4*5/4), syn(saw, c4*3/2)}},
		{name: "equal C major, close, saw ×3", snr: 40, voices: []voice{syn(saw, c4), syn(saw, e4), syn(saw, g4)}},
		{name: "just C major, open (C3 G3 E4)", snr: 35, voices: []voice{syn(weak, c3), syn(saw, c3*3/2), syn(odd, c3*5/2)}},
		{name: "equal G7, four timbres", snr: 40, voices: []voice{syn(weak, g3), syn(odd, b3), syn(saw, d4), syn(second, f4)}},
		{name: "just fifth duet", snr: 45, voices: []voice{syn(saw, g3), syn(second, g3*3/2)}},
		{name: "just C major, vibrato third", snr: 40, voices: []voice{syn(saw, c4),
			synth(saw, c4*5/4, testsignal.Vibrato(c4*5/4, 40, 5.5), n, true), syn(odd, c4*3/2)}},
	}
	font, fh, err := sf2.OpenFile(fluidR3)
	if err != nil {
		return nil, fmt.Errorf("FluidR3 SoundFont (Debian fluid-soundfont-gm): %w", err)
	}
	defer fh.Close()
	loops, err := font.Loops([]string{"Clarinet", "Trombone", "Tuba"}, 12, 4096)
	if err != nil {
		return nil, err
	}
	by := map[string][]sf2.Loop{}
	for _, l := range loops {
		by[l.Instrument] = append(by[l.Instrument], l)
	}
	real := func(inst string, hz float64) voice {
		l, _ := sf2.Nearest(by[inst], hz)
		x, f := l.At(rate, hz, n)
		return voice{x: x, hz: f, amps: partialAmps(x, f)}
	}
	out = append(out,
		mixture{name: "FluidR3 just C major (tuba, trombone, clarinet)", snr: 40, voices: []voice{real("Tuba", c3), real("Trombone", c3*3/2), real("Clarinet", c3*5/2)}},
		mixture{name: "FluidR3 just A minor (trombone, clarinet ×2)", snr: 35, voices: []voice{real("Trombone", a3), real("Clarinet", a3*6/5), real("Clarinet", a3*3/2)}},
		mixture{name: "FluidR3 equal G7 (tuba, trombone, clarinet ×2)", snr: 40, voices: []voice{real("Tuba", g3/2), real("Trombone", b3), real("Clarinet", d4), real("Clarinet", f4)}},
	)
	for i := range out {
		m := &out[i]
		m.x = make([]float64, n)
		for _, v := range m.voices {
			for j := range m.x {
				m.x[j] += v.x[j]
			}
		}
		m.sigma = testsignal.AddNoise(m.x, testsignal.White(rand.New(rand.NewPCG(uint64(i), 1)), n), m.snr)
	}
	return out, nil
}

// synth is a testsignal tone at peak 0.2 with its partial amplitudes as
// present after normalising.
func synth(s testsignal.Spectrum, hz float64, track func(float64) float64, n int, vibrato bool) voice {
	x := testsignal.Tone(rate, n, s, 0.2, track)
	return voice{x: x, hz: hz, amps: partialAmps(x, hz), vibrato: vibrato}
}

// partialAmps measures each partial's amplitude of a steady periodic signal
// by projecting it on the partial's sinusoids (least squares over the whole
// first half second; exact for a whole number of cycles, close enough
// otherwise).
func partialAmps(x []float64, hz float64) []float64 {
	x = x[:min(len(x), int(rate/2))]
	var amps []float64
	for k := 1; float64(k)*hz < 0.45*rate && k <= 96; k++ {
		var c, s float64
		w := 2 * math.Pi * float64(k) * hz / rate
		for i, v := range x {
			sn, cs := math.Sincos(w * float64(i))
			c += v * cs
			s += v * sn
		}
		amps = append(amps, 2*math.Hypot(c, s)/float64(len(x)))
	}
	return amps
}
