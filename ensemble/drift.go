package ensemble

import (
	"math"
	"slices"
	"sync"

	"fifthline/target"
)

// DriftTick is the time between moments, in seconds.
const DriftTick = 0.1

// DriftSeconds is how much of the past the drift is the median of.
const DriftSeconds = 4.0

// driftMoments is how many moments with sound a drift needs to be known:
// half a second of playing.
const driftMoments = 5

// driftCapacity bounds the samples kept: DriftSeconds of moments for up to
// six players. A larger group keeps a shorter past, never more memory.
const driftCapacity = 6 * int(DriftSeconds/DriftTick)

// Drift estimates the group's drift as it goes, in constant memory: feed
// it moments (Moment) or every player's frames (Frame) in time order and
// ask Cents at any time, from any goroutine (the meter reads while the
// listening loop feeds).
type Drift struct {
	mu      sync.Mutex
	tu      target.Tuning
	seventh float64
	ring    []driftSample // the last samples, oldest at head once full
	head    int
	now     float64
	inside  Inside
	frames  framePitches
	scratch []float64
}

type driftSample struct{ t, cents float64 }

// Inside is how the chords heard were tuned inside themselves: the mean
// size of their thirds' and fifths' just_cents, whichever way, one per
// moment and member.
type Inside struct {
	Thirds, Fifths     float64 // mean |just_cents|
	NThirds, NFifths   int
	sumThird, sumFifth float64
}

func (in *Inside) add(role string, just float64) {
	switch role {
	case "third":
		in.sumThird += math.Abs(just)
		in.NThirds++
		in.Thirds = in.sumThird / float64(in.NThirds)
	case "fifth":
		in.sumFifth += math.Abs(just)
		in.NFifths++
		in.Fifths = in.sumFifth / float64(in.NFifths)
	}
}

// NewDrift reads the group against tu; seventh is the minor seventh's
// just ratio, as for Chords.
func NewDrift(tu target.Tuning, seventh float64) *Drift {
	tu.Chord = nil
	return &Drift{tu: tu, seventh: seventh, ring: make([]driftSample, 0, driftCapacity)}
}

// Moment adds the pitches (hertz) sounding together at t seconds.
func (d *Drift) Moment(t float64, hz []float64) {
	d.mu.Lock()
	defer d.mu.Unlock()
	d.moment(t, hz)
}

func (d *Drift) moment(t float64, hz []float64) {
	d.now = t
	d.scratch = d.samples(hz, d.scratch[:0])
	for _, c := range d.scratch {
		s := driftSample{t, c}
		if len(d.ring) < cap(d.ring) {
			d.ring = append(d.ring, s)
			continue
		}
		d.ring[d.head] = s
		d.head = (d.head + 1) % len(d.ring)
	}
}

// samples appends one sample per pitch (see the package's definition).
func (d *Drift) samples(hz []float64, out []float64) []float64 {
	for _, f := range hz {
		if !(f > 0) || math.IsInf(f, 0) {
			return out // not a pitch: the moment says nothing
		}
	}
	if len(hz) >= 2 {
		if c, ok := d.tu.NameChord(hz, d.seventh); ok {
			root := c.Members[slices.IndexFunc(c.Members, func(m target.HeardMember) bool { return m.Role == "root" })]
			if d.tu.Classify(root.Hz).OnOther {
				return out
			}
			for _, m := range c.Members {
				out = append(out, root.Cents+m.JustCents)
				d.inside.add(m.Role, m.JustCents)
			}
			return out
		}
	}
	for _, f := range hz {
		if r := d.tu.Classify(f); !r.OnOther {
			out = append(out, r.Deviation)
		}
	}
	return out
}

// Cents is the drift now (the median over the last DriftSeconds of
// moments): + the group sits sharp, − flat; false while too little has
// sounded to say.
func (d *Drift) Cents() (float64, bool) {
	d.mu.Lock()
	defer d.mu.Unlock()
	c, _, ok := d.window()
	return c, ok
}

// window is the median of the recent samples and the middle of the time
// they span.
func (d *Drift) window() (cents, centre float64, ok bool) {
	vals := d.scratch[:0]
	first, last, moments := math.Inf(1), math.Inf(-1), 0
	// Oldest first: from head to the end of the ring, then from its start.
	for _, part := range [][]driftSample{d.ring[d.head:], d.ring[:d.head]} {
		for _, s := range part {
			if s.t <= d.now-DriftSeconds {
				continue
			}
			vals = append(vals, s.cents)
			if s.t != last {
				moments++
			}
			first, last = min(first, s.t), s.t
		}
	}
	d.scratch = vals
	if moments < driftMoments {
		return 0, 0, false
	}
	return median(vals), (first + last) / 2, true
}

// Chords says how the chords heard so far were tuned inside themselves.
func (d *Drift) Chords() Inside {
	d.mu.Lock()
	defer d.mu.Unlock()
	return d.inside
}

// median sorts xs and returns its middle value.
func median(xs []float64) float64 {
	slices.Sort(xs)
	n := len(xs)
	if n%2 == 1 {
		return xs[n/2]
	}
	return (xs[n/2-1] + xs[n/2]) / 2
}
