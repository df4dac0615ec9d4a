package sf2

import (
	"fmt"
	"math"
	"os"
	"strings"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Loop is a sample loop that holds a whole number of cycles: played over
// and over it has the exact fundamental Hz = Cycles·Rate/len(Frames).
type Loop struct {
	Instrument, Sample string
	Rate               float64
	Cycles             int
	Hz                 float64
	Frames             []float64
}

// OpenFile opens a SoundFont file; close the returned file when done.
func OpenFile(path string) (*Font, *os.File, error) {
	fh, err := os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	st, err := fh.Stat()
	if err != nil {
		fh.Close()
		return nil, nil, err
	}
	f, err := Open(fh, st.Size())
	if err != nil {
		fh.Close()
		return nil, nil, err
	}
	return f, fh, nil
}

// FlawedLoops are loops whose seam breaks the waveform although the sample
// values meet: at FluidR3's "Cello G3(L)" the harmonic comb's share of the
// spectrum falls from 0.8 to 0.03 for the frames spanning each seam.
var FlawedLoops = map[string]bool{"Cello G3(L)": true}

// Loops returns up to perInstrument loops (left channel or mono, at most
// maxFrames long) for each instrument named, keeping only loops that hold
// the header's whole number of cycles (HoldsCycles), meet without a click
// (Seamless) and are not listed in FlawedLoops.
func (f *Font) Loops(names []string, perInstrument, maxFrames int) ([]Loop, error) {
	var out []Loop
	for _, in := range f.Instruments {
		want := false
		for _, n := range names {
			want = want || strings.EqualFold(in.Name, n)
		}
		if !want {
			continue
		}
		seen := map[int]bool{}
		for _, z := range in.Zones {
			s := f.Samples[z.Sample]
			_, k, ok := s.LoopTruth(f.NominalHz(z))
			if !ok || seen[z.Sample] || strings.HasSuffix(s.Name, "(R)") || len(seen) == perInstrument ||
				int(s.LoopEnd-s.LoopStart) > maxFrames || FlawedLoops[s.Name] {
				continue
			}
			frames, err := f.Frames(s.LoopStart, s.LoopEnd)
			if err != nil {
				return nil, fmt.Errorf("sf2: %s: %w", s.Name, err)
			}
			if !HoldsCycles(frames, k) || !Seamless(frames) {
				continue
			}
			seen[z.Sample] = true
			out = append(out, Loop{in.Name, s.Name, float64(s.Rate), k,
				float64(k) * float64(s.Rate) / float64(len(frames)), frames})
		}
	}
	return out, nil
}

// HoldsCycles checks, without any pitch detector, that a loop holds k whole
// cycles: most of its energy then sits in the loop's DFT bins that are
// multiples of k, and less under k-1 or k+1.
func HoldsCycles(loop []float64, k int) bool {
	c := fourier.NewFFT(len(loop)).Coefficients(nil, loop)
	s := combShare(c, k)
	return s > 0.8 && s > combShare(c, k+1) && (k == 1 || s > combShare(c, k-1))
}

// combShare is the share of a loop's energy (DC left out) in its DFT bins
// c that are multiples of k: the harmonics of k cycles per loop.
func combShare(c []complex128, k int) float64 {
	var on, all float64
	for i, z := range c[1:] {
		p := real(z)*real(z) + imag(z)*imag(z)
		all += p
		if (i+1)%k == 0 {
			on += p
		}
	}
	return on / all
}

// Seamless reports whether the step from a loop's last sample back to its
// first is no larger than its ordinary sample-to-sample steps: a clicking
// seam is a flaw of the sample, not of any instrument.
func Seamless(loop []float64) bool {
	var ss float64
	for i := 1; i < len(loop); i++ {
		ss += (loop[i] - loop[i-1]) * (loop[i] - loop[i-1])
	}
	rms := math.Sqrt(ss / float64(len(loop)-1))
	return math.Abs(loop[0]-loop[len(loop)-1]) <= 4*rms
}
