package session

import (
	"context"
	"errors"
	"io"
	"math"
	"testing"

	"fifthline/target"
)

// tones is an in-memory Source: a sequence of sine tones (hz 0 = silence),
// each lasting the given seconds. Optionally it blocks forever at the end,
// like a microphone, instead of returning io.EOF.
type tones struct {
	rate    float64
	parts   []tonePart
	pos     int
	endless bool
	phase   float64
}

type tonePart struct{ hz, seconds float64 }

func (s *tones) SampleRate() float64 { return s.rate }

func (s *tones) Read(p []float32) (int, error) {
	n := 0
	for n < len(p) {
		i := s.at(s.pos)
		if i < 0 {
			if s.endless {
				p[n] = 0
				n++
				continue
			}
			if n == 0 {
				return 0, io.EOF
			}
			return n, nil
		}
		p[n] = 0
		if hz := s.parts[i].hz; hz > 0 {
			s.phase += 2 * math.Pi * hz / s.rate
			p[n] = float32(0.3 * math.Sin(s.phase))
		}
		n++
		s.pos++
	}
	return n, nil
}

// at finds which part sample k falls in.
func (s *tones) at(k int) int {
	for i, pt := range s.parts {
		l := int(pt.seconds * s.rate)
		if k < l {
			return i
		}
		k -= l
	}
	return -1
}

func collect(t *testing.T, ctx context.Context, src *tones, tu target.Tuning) ([]Event, int, error) {
	t.Helper()
	var evs []Event
	frames := 0
	err := Run(ctx, src, Options{Name: "test", Tunings: NewTunings(tu),
		OnFrame: func(Frame) { frames++ },
		OnNote:  func(e Event) error { evs = append(evs, e); return nil }})
	return evs, frames, err
}

// Two tones separated by silence give two held notes, each read in the tuning
// (ISO 16 equal temperament: 440 Hz is A4, 261.626 Hz is C4).
func TestRunReadsHeldNotesToTheEnd(t *testing.T) {
	src := &tones{rate: 48000, parts: []tonePart{{440, 0.6}, {0, 0.3}, {261.626, 0.6}}}
	evs, frames, err := collect(t, context.Background(), src, target.Default())
	if err != nil {
		t.Fatal(err)
	}
	if len(evs) != 2 || evs[0].Reading.Note.String() != "A4" || evs[1].Reading.Note.String() != "C4" {
		t.Fatalf("events %+v", evs)
	}
	if frames == 0 || evs[0].Source != "test" || math.Abs(evs[0].Reading.Deviation) > 0.05 {
		t.Errorf("frames %d, first event %+v", frames, evs[0])
	}
}

// Cancelling (Ctrl-C) finishes the note being held instead of losing it.
func TestRunDeliversTheHeldNoteOnCancel(t *testing.T) {
	src := &tones{rate: 48000, parts: []tonePart{{440, 5}}, endless: true}
	ctx, cancel := context.WithCancel(context.Background())
	var evs []Event
	frames := 0
	err := Run(ctx, src, Options{Tunings: NewTunings(target.Default()),
		OnFrame: func(Frame) {
			if frames++; frames == 100 {
				cancel()
			}
		},
		OnNote: func(e Event) error { evs = append(evs, e); return nil }})
	if !errors.Is(err, context.Canceled) || len(evs) != 1 || evs[0].Reading.Note.String() != "A4" {
		t.Fatalf("err %v, events %+v", err, evs)
	}
}

// A failing sink (a full disk, say) stops the run with its error.
func TestRunStopsOnSinkError(t *testing.T) {
	src := &tones{rate: 44100, parts: []tonePart{{440, 0.5}, {0, 0.3}, {330, 0.5}}}
	boom := errors.New("disk full")
	err := Run(context.Background(), src, Options{Tunings: NewTunings(target.Default()),
		OnNote: func(Event) error { return boom }})
	if !errors.Is(err, boom) {
		t.Fatalf("err %v, want %v", err, boom)
	}
}

// The tuning may change while listening; each note is read in the tuning
// current when it ends.
func TestTuningsSwap(t *testing.T) {
	ts := NewTunings(target.Default())
	tu := target.Default()
	tu.A4 = 415
	ts.Set(tu)
	if ts.Get().A4 != 415 {
		t.Fatal("Set did not take")
	}
}

func TestRecordMatchesHeader(t *testing.T) {
	ev := Event{Source: "a.wav", Reading: target.Default().Classify(440)}
	for _, wf := range []bool{false, true} {
		if h, r := Header(wf), ev.Record(wf); len(h) != len(r) {
			t.Errorf("withFile %v: %d columns, %d values", wf, len(h), len(r))
		}
	}
	if got := target.Decimal(-0.0001, 2); got != "0.00" {
		t.Errorf("target.Decimal(-0.0001, 2) = %q", got)
	}
}
