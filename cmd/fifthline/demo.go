package main

import (
	"errors"
	"io"
	"math"
	"time"

	"fifthline/capture"
	"fifthline/session"
	"fifthline/target"
)

func init() {
	register("demo", "the live meter fed by an embedded performance, no microphone needed", runDemo)
}

// demoRate is the sample rate the demo performance is rendered at.
const demoRate = 48000

func runDemo(e *env, args []string) error {
	fs := newFlags("demo")
	mf := addMusicalFlags(fs)
	// The meter reads the demo in the tuning its score is written for
	// unless the flags say otherwise.
	for name, v := range map[string]*string{"key": &mf.key, "temperament": &mf.temperament, "a4": &mf.a4} {
		def := map[string]string{"key": demoScore.key, "temperament": demoScore.temperament, "a4": demoScore.a4}[name]
		*v = def
		fs.Lookup(name).DefValue = def
	}
	jf := addJournalFlags(fs)
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("demo takes no arguments (got %q)", pos[0])
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	score, err := demoTuning()
	if err != nil {
		return err
	}
	e, restore, err := muteLibraries(e)
	if err != nil {
		return err
	}
	defer restore()
	j, err := jf.open(e)
	if err != nil {
		return err
	}
	src := realTime(standInPerformance(score, demoRate))
	opts := session.Options{Name: "demo", Tunings: session.NewTunings(tu)}
	err = runMeter(e.ctx, src, opts, j, meterSource{name: "the demo performance"})
	return errors.Join(stopped(err), j.close())
}

// standInPerformance renders the demo score as a plain harmonic tone at
// -20 dBFS peak, each note at its target in the score's tuning moved by the
// player's cents. It stands in until the reed voice of the demo lands
// (capture's performance synthesiser); it plays nothing aloud.
func standInPerformance(tu target.Tuning, rate float64) capture.Source {
	beat := 60 / demoScore.bpm
	var out []float32
	const peak = 0.1 // -20 dBFS
	for _, sn := range demoScore.notes {
		n := int(sn.beats * beat * rate)
		if sn.note == "" {
			out = append(out, make([]float32, n)...)
			continue
		}
		note, err := target.ParseNote(sn.note)
		if err != nil {
			continue // the score is ours and parses; skip rather than panic
		}
		hz := tu.Target(note) * math.Exp2(sn.cents/1200)
		phase := 0.0
		for i := range n {
			t := float64(i) / rate
			f := hz
			if sn.vibrato && t > 0.4 {
				f *= math.Exp2(12 * math.Sin(2*math.Pi*5.5*t) / 1200) // ±12 ¢ at 5.5 Hz
			}
			phase += 2 * math.Pi * f / rate
			env := math.Min(1, math.Min(t/0.03, (float64(n-i)/rate)/0.06)) // attack, release
			v := math.Sin(phase) + 0.5*math.Sin(2*phase) + 0.3*math.Sin(3*phase)
			out = append(out, float32(peak*env*v/1.8)) // partials sum to at most 1.8
		}
	}
	return &samples{rate: rate, data: out}
}

// samples is a Source over samples in memory.
type samples struct {
	rate float64
	data []float32
}

func (s *samples) SampleRate() float64 { return s.rate }

func (s *samples) Read(p []float32) (int, error) {
	if len(s.data) == 0 {
		return 0, io.EOF
	}
	n := copy(p, s.data)
	s.data = s.data[n:]
	return n, nil
}

// paceBlock is the most a paced Read returns: about 10 ms at 48 kHz.
const paceBlock = 512

// paced delivers a source no faster than real time, as a microphone would.
type paced struct {
	src   capture.Source
	start time.Time
	sent  int
}

func realTime(src capture.Source) capture.Source { return &paced{src: src} }

func (p *paced) SampleRate() float64 { return p.src.SampleRate() }

func (p *paced) Read(b []float32) (int, error) {
	if p.start.IsZero() {
		p.start = time.Now()
	}
	n, err := p.src.Read(b[:min(len(b), paceBlock)])
	p.sent += n
	// A block is ready once its last sample would have been heard.
	time.Sleep(time.Until(p.start.Add(time.Duration(float64(p.sent) / p.src.SampleRate() * float64(time.Second)))))
	return n, err
}
