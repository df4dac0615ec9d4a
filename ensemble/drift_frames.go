package ensemble

import (
	"math"

	"fifthline/pitchdetect"
)

// framePitches turns every player's frames into one pitch per player per
// moment: the mean of the longest steady run of frames the player held
// within the moment, so that a note change inside a moment gives the
// longer of the two notes, not a pitch between them.
type framePitches struct {
	started bool
	start   float64 // the current moment's start, seconds
	runs    []pitchRun
	hz      []float64
}

// pitchRun is one player's frames within 50 ¢ of their running mean.
type pitchRun struct {
	sumLog      float64 // sum of log2 of the frames' hertz
	n           int
	first, last float64
	best        float64 // the moment's longest run so far: its mean, hertz
	bestSpan    float64
}

// runCents is how far a frame may lie from its run's mean and still
// belong to it (the segmenter's limit for one note).
const runCents = 50

// runShare is how much of a moment a run must cover to speak for it.
const runShare = 0.4

func (r *pitchRun) end() {
	if r.n > 0 && r.last-r.first >= r.bestSpan {
		r.best, r.bestSpan = math.Exp2(r.sumLog/float64(r.n)), r.last-r.first
	}
	r.n, r.sumLog = 0, 0
}

func (r *pitchRun) add(t, hz float64) {
	if r.n > 0 && math.Abs(1200*(math.Log2(hz)-r.sumLog/float64(r.n))) > runCents {
		r.end()
	}
	if r.n == 0 {
		r.first = t
	}
	r.sumLog += math.Log2(hz)
	r.n++
	r.last = t
}

// Frame adds player i's frame (as Options.OnFrame gives it, so that
// OnFrame: drift.Frame wires the live meter); frames come in time order,
// every player's frame of a moment before the next moment's. Unvoiced
// frames (rests, another player's bleed) end the player's run.
func (d *Drift) Frame(i int, e pitchdetect.Estimate) {
	d.mu.Lock()
	defer d.mu.Unlock()
	f := &d.frames
	for len(f.runs) <= i {
		f.runs = append(f.runs, pitchRun{})
	}
	if !f.started {
		f.started, f.start = true, e.Time
	}
	if e.Time >= f.start+DriftTick {
		f.hz = f.hz[:0]
		for k := range f.runs {
			r := &f.runs[k]
			r.end()
			if r.bestSpan >= runShare*DriftTick {
				f.hz = append(f.hz, r.best)
			}
			r.best, r.bestSpan = 0, 0
		}
		d.moment(f.start+DriftTick/2, f.hz)
		f.start += DriftTick * math.Floor((e.Time-f.start)/DriftTick)
	}
	r := &f.runs[i]
	if !e.Voiced || e.Hz <= 0 {
		r.end()
		return
	}
	r.add(e.Time, e.Hz)
}
