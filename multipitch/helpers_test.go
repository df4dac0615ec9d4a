package multipitch

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"fifthline/internal/testsignal"
)

const rate = 44100.0

// part is one voice of a test chord: a spectrum and a pitch track.
type part struct {
	spec testsignal.Spectrum
	hz   func(t float64) float64
	ctr  float64 // the pitch it should be read at (vibrato centre)
}

func steady(s testsignal.Spectrum, hz float64) part { return part{s, testsignal.Steady(hz), hz} }

// chord mixes the parts, each at the same peak level before mixing, for the
// given seconds, with white noise at snrDB (0: none).
func chord(seconds, snrDB float64, seed uint64, parts ...part) []float64 {
	n := int(seconds * rate)
	x := make([]float64, n)
	for _, p := range parts {
		for i, v := range testsignal.Tone(rate, n, p.spec, 0.2, p.hz) {
			x[i] += v
		}
	}
	if snrDB > 0 {
		testsignal.AddNoise(x, testsignal.White(newRand(seed), n), snrDB)
	}
	return x
}

// score is how an estimator's frames compare with the truth.
type score struct {
	frames, phantoms, missed int
	doubled                  []int     // frames each true voice was marked doubled in
	errs                     []float64 // |cents| of every matched voice in every frame
	worst                    float64
	perVoice                 [][]float64 // signed cents per true voice, frame by frame
}

func (s score) median() float64 {
	if len(s.errs) == 0 {
		return math.NaN()
	}
	e := slices.Clone(s.errs)
	slices.Sort(e)
	return e[len(e)/2]
}

// hear runs a fresh estimator over x and scores the frames whose window lies
// wholly inside [from, to) seconds against the truth (Hz); an estimated
// voice within 50 ¢ of a true one is that voice, any other is a phantom.
func hear(t *testing.T, x []float64, cfg Config, from, to float64, truth ...float64) score {
	t.Helper()
	e, err := New(rate, 0, 0, cfg)
	if err != nil {
		t.Fatal(err)
	}
	s := score{perVoice: make([][]float64, len(truth)), doubled: make([]int, len(truth))}
	half := float64(e.Window()) / 2 / rate
	e.Feed(testsignal.Float32(x), func(f Frame) {
		if f.Time-half < from || f.Time+half > to {
			return
		}
		s.frames++
		used := make([]bool, len(f.Voices))
		for i, hz := range truth {
			best, bc := -1, 50.0
			for j, v := range f.Voices {
				if c := math.Abs(testsignal.Cents(v.Hz, hz)); !used[j] && c < bc {
					best, bc = j, c
				}
			}
			if best < 0 {
				s.missed++
				continue
			}
			used[best] = true
			if f.Voices[best].Doubled {
				s.doubled[i]++
			}
			c := testsignal.Cents(f.Voices[best].Hz, hz)
			s.errs = append(s.errs, math.Abs(c))
			s.perVoice[i] = append(s.perVoice[i], c)
			s.worst = math.Max(s.worst, math.Abs(c))
		}
		for _, u := range used {
			if !u {
				s.phantoms++
			}
		}
	})
	return s
}

// meets checks the figures: every true voice found in every frame,
// median error ≤ 0.5 ¢, every voice within maxCents, phantoms ≤ 10 % of the
// voices reported.
func (s score) meets(t *testing.T, what string, maxCents float64) {
	t.Helper()
	if s.frames < 2 || s.missed > 0 || s.median() > 0.5 || s.worst > maxCents || 10*s.phantoms > s.frames*len(s.perVoice) {
		t.Errorf("%s: %d frames, %d missed, %d phantoms, median %.3f ¢, worst %.3f ¢ (want none missed, median ≤ 0.5, worst ≤ %g)",
			what, s.frames, s.missed, s.phantoms, s.median(), s.worst, maxCents)
		return
	}
	t.Logf("%s: %d frames, median %.4f ¢, worst %.4f ¢, %d phantoms, marked doubled %v", what, s.frames, s.median(), s.worst, s.phantoms, s.doubled)
}

func newRand(seed uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, 7)) }
