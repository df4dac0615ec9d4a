package session

import (
	"context"
	"errors"
	"io"
	"sync/atomic"

	"fifthline/pitchdetect"
	"fifthline/source"
	"fifthline/target"
)

// Event is one held note, heard and read in the tuning that was current when
// it ended.
type Event struct {
	Source string // file path or device name
	Player string // who played it, where several players are heard; "" for one
	pitchdetect.Held
	Reading target.Reading
	Tuning  target.Tuning
}

// Frame is one analysis frame, for live display.
type Frame struct {
	pitchdetect.Estimate
	Reading target.Reading // zero when unvoiced
	// Holding is true while a note is held; Held is that note so far and
	// HeldReading its reading (centre pitch in the current tuning).
	Holding     bool
	Held        pitchdetect.Held
	HeldReading target.Reading
}

// Tunings holds the current tuning; the meter swaps it while listening
// (moving the tonic, cycling temperaments) and the loop reads it per frame.
type Tunings struct{ p atomic.Pointer[target.Tuning] }

// NewTunings holds t.
func NewTunings(t target.Tuning) *Tunings {
	var ts Tunings
	ts.Set(t)
	return &ts
}

// Get returns the current tuning.
func (ts *Tunings) Get() target.Tuning { return *ts.p.Load() }

// Set makes t the current tuning.
func (ts *Tunings) Set(t target.Tuning) { ts.p.Store(&t) }

// Current returns the current tuning and whether it is the one last seen
// (*seen, updated): a reader that derives state from the tuning (the
// group's drift) starts that state afresh when a key has changed it.
func (ts *Tunings) Current(seen **target.Tuning) (t target.Tuning, same bool) {
	p := ts.p.Load()
	same = p == *seen
	*seen = p
	return *p, same
}

// Options configure Run. Window and Hop are in samples; 0 lets the detector
// choose. OnFrame and OnNote may be nil. An error from OnNote stops Run.
type Options struct {
	Name        string // Event.Source
	Tunings     *Tunings
	Window, Hop int
	BlockSize   int // samples per Read; 0 means 512
	OnFrame     func(Frame)
	OnNote      func(Event) error
}

// Run reads src until it ends (io.EOF), ctx is cancelled, or a sink fails.
// The note being held when the stream ends or ctx is cancelled is finished
// and delivered, so nothing heard is lost. A finished stream returns nil;
// cancellation returns ctx.Err().
func Run(ctx context.Context, src source.Source, opt Options) error {
	det, err := pitchdetect.New(src.SampleRate(), opt.Window, opt.Hop)
	if err != nil {
		return err
	}
	seg := det.NewSegmenter() // it trims by this window, not a default number of hops
	seg.Reread = det.Reread
	block := make([]float32, max(opt.BlockSize, 1))
	if opt.BlockSize == 0 {
		block = make([]float32, 512)
	}
	var est []pitchdetect.Estimate
	deliver := func(h pitchdetect.Held) error {
		if opt.OnNote == nil {
			return nil
		}
		tu := opt.Tunings.Get()
		return opt.OnNote(Event{Source: opt.Name, Held: h, Reading: tu.Classify(h.Hz), Tuning: tu})
	}
	finish := func() error {
		if h, ok := seg.Flush(); ok {
			return deliver(h)
		}
		return nil
	}
	for {
		if err := ctx.Err(); err != nil {
			if ferr := finish(); ferr != nil {
				return ferr
			}
			return err
		}
		n, rerr := src.Read(block)
		est = det.Feed(block[:n], est[:0])
		for _, e := range est {
			if h, done := seg.Push(e); done {
				if err := deliver(h); err != nil {
					return err
				}
			}
			if opt.OnFrame != nil {
				opt.OnFrame(frame(opt.Tunings.Get(), e, seg))
			}
		}
		if rerr != nil {
			ferr := finish()
			if errors.Is(rerr, io.EOF) {
				return ferr
			}
			return errors.Join(rerr, ferr)
		}
	}
}

func frame(tu target.Tuning, e pitchdetect.Estimate, seg *pitchdetect.Segmenter) Frame {
	f := Frame{Estimate: e}
	if e.Voiced {
		f.Reading = tu.Classify(e.Hz)
	}
	if h, ok := seg.Current(); ok {
		f.Holding, f.Held, f.HeldReading = true, h, tu.Classify(h.Hz)
	}
	return f
}
