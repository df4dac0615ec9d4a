package main

import (
	"fmt"
	"math"
	"sort"
	"time"
)

// tally gathers one detector's results over all clips.
type tally struct {
	steadyErr       []float64 // |cents| of voiced frames on exact-truth clips
	toneFrames      int       // frames on tone clips (steady + rendered)
	unvoiced, gross int
	vibErr, intErr  []float64
	noiseFrames     int
	falsePitch      int
	crbRatio        []float64
	firstRead       []float64 // seconds
	missedOnsets    int
	cpu             time.Duration
	audio           float64            // seconds
	longCPU         float64            // CPU seconds per second on the long clip
	pending         map[int][2]float64 // interval pair → first clip's measured and true Hz
}

func newTally() *tally { return &tally{pending: map[int][2]float64{}} }

// settled reports whether a frame lies in a clip's settled part: after the
// first full analysis window, clear of the end.
func settled(t, dur float64) bool { return t >= 0.1 && t <= dur-0.05 }

func (ta *tally) add(c clip, r result, ours bool) {
	dur := float64(len(c.x)) / c.rate
	if c.kind == long {
		ta.longCPU = r.cpu.Seconds() / dur
		return
	}
	ta.cpu += r.cpu
	ta.audio += dur
	switch c.kind {
	case steady, rendered:
		for i, t := range r.t {
			if !settled(t, dur) {
				continue
			}
			ta.toneFrames++
			if r.hz[i] <= 0 {
				ta.unvoiced++
				continue
			}
			e := math.Abs(cents(r.hz[i], c.hz))
			if e > 50 {
				ta.gross++
			}
			if c.kind == steady {
				ta.steadyErr = append(ta.steadyErr, e)
			}
		}
	case vibrato:
		var centre float64
		if ours {
			best := -1
			for i, h := range r.held {
				if best < 0 || h.Frames > r.held[best].Frames {
					best = i
				}
			}
			if best < 0 {
				ta.vibErr = append(ta.vibErr, math.Inf(1))
				return
			}
			centre = r.held[best].Hz
		} else {
			centre = wholeCycleMean(r.track, 0.2, dur-0.2, c.vibRate)
		}
		ta.vibErr = append(ta.vibErr, math.Abs(cents(centre, c.hz)))
	case interval:
		n := math.Floor((dur - 0.3) / c.loopSec)
		m := meanHz(r.track, 0.15, 0.15+n*c.loopSec)
		if first, ok := ta.pending[c.pair]; ok {
			ta.intErr = append(ta.intErr, math.Abs(cents(m, first[0])-cents(c.hz, first[1])))
		} else {
			ta.pending[c.pair] = [2]float64{m, c.hz}
		}
	case noise:
		for i := range r.t {
			ta.noiseFrames++
			if r.hz[i] > 0 {
				ta.falsePitch++
			}
		}
	case onset:
		if math.IsNaN(r.firstRead) {
			ta.missedOnsets++
		} else {
			ta.firstRead = append(ta.firstRead, r.firstRead)
		}
	case crb:
		var xs []float64
		for i, t := range r.t {
			if settled(t, dur) && r.hz[i] > 0 && math.Abs(cents(r.hz[i], c.hz)) < 50 {
				xs = append(xs, r.hz[i])
			}
		}
		if len(xs) > 2 {
			_, sd := meanStd(xs)
			ta.crbRatio = append(ta.crbRatio, sd/c.crbHz)
		}
	}
}

// wholeCycleMean is the mean pitch (in cents about the first voiced frame,
// returned in Hz) of voiced frames within [t0, t1] trimmed to a whole
// number of cycles of a vibrato at rate: the same centre definition the
// Segmenter uses, given the true rate.
func wholeCycleMean(tr track, t0, t1, rate float64) float64 {
	span := math.Floor((t1-t0)*rate) / rate
	t1 = t0 + span
	return meanHz(tr, t0, t1)
}

// meanHz is the geometric mean of the voiced frames in [t0, t1).
func meanHz(tr track, t0, t1 float64) float64 {
	var s float64
	n := 0
	for i, t := range tr.t {
		if t >= t0 && t < t1 && tr.hz[i] > 0 {
			s += math.Log2(tr.hz[i])
			n++
		}
	}
	if n == 0 {
		return math.NaN()
	}
	return math.Pow(2, s/float64(n))
}

func meanStd(x []float64) (float64, float64) {
	var m, v float64
	for _, a := range x {
		m += a
	}
	m /= float64(len(x))
	for _, a := range x {
		v += (a - m) * (a - m)
	}
	return m, math.Sqrt(v / float64(len(x)-1))
}

// quantile of x (sorted in place); NaN for no data.
func quantile(x []float64, q float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	sort.Float64s(x)
	return x[min(int(q*float64(len(x))), len(x)-1)]
}

func f(format string, v float64) string {
	if math.IsNaN(v) {
		return "—"
	}
	if math.IsInf(v, 1) {
		return "none"
	}
	return fmt.Sprintf(format, v)
}
