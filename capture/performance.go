package capture

import (
	"io"
	"math"
	"time"
)

// Tone is one note (or rest) of a synthetic performance.
type Tone struct {
	Hz           float64 // fundamental frequency; with vibrato, its centre; not positive: silence
	Seconds      float64 // length, including the soft attack and release
	Gain         float64 // 0..1 of the voice's full level (peaks stay under -6 dBFS); 0 means 1
	VibratoCents float64 // vibrato depth either side of Hz, in cents
	VibratoHz    float64 // vibrato rate
	Rest         bool    // silence for Seconds
}

// voiceHarmonics is the amplitude of each partial of our instrument voice,
// fundamental first: a mellow reed-like colour, our own choice.
var voiceHarmonics = []float64{1, 0.5, 0.33, 0.25, 0.12, 0.1, 0.05, 0.04, 0.02}

const (
	breathLevel   = 0.02  // low-passed noise beside the harmonics, same scale
	attackTime    = 0.04  // seconds of raised-cosine fade in
	releaseTime   = 0.06  // seconds of fade out
	vibratoOnset  = 0.3   // seconds for vibrato to reach full depth, as players do
	maxPeak       = 0.5   // -6.02 dBFS: the ceiling on every sample
	pacedBlockSec = 0.020 // a paced Read returns no less than this much audio, as a device does (PulseAudio: 21–43 ms)
)

// voiceScale makes the loudest possible sum (every partial and the noise
// at full swing together) land on maxPeak.
var voiceScale = func() float64 {
	sum := breathLevel
	for _, a := range voiceHarmonics {
		sum += a
	}
	return maxPeak / sum
}()

// Performance plays a list of tones with a resynthesised instrument voice:
// fixed harmonic colour, soft attack and release, a little breath noise,
// vibrato if asked, and a phase that runs on unbroken from note to note.
// It is deterministic: the same score gives the same samples.
type Performance struct {
	rate     float64
	tones    []Tone
	realtime bool
	start    time.Time
	emitted  int64

	tone       int   // the tone being played
	at, length int64 // sample within it, and its length in samples
	phase      float64
	noise      uint64  // xorshift state
	breath     float64 // low-passed noise
}

// NewPerformance plays tones at the given rate. With realtime set, Read
// paces itself to the wall clock like a live input: audio becomes
// available as the performance goes on, so a meter shows it as played.
func NewPerformance(rate float64, tones []Tone, realtime bool) *Performance {
	p := &Performance{rate: rate, tones: tones, realtime: realtime, tone: -1, noise: 0x9E3779B97F4A7C15}
	p.nextTone()
	return p
}

// SampleRate is the rate given to NewPerformance.
func (p *Performance) SampleRate() float64 { return p.rate }

// Duration is the length of the whole performance in seconds.
func (p *Performance) Duration() float64 {
	total := 0.0
	for _, t := range p.tones {
		total += max(t.Seconds, 0)
	}
	return total
}

// nextTone moves to the next tone that lasts at least one sample.
func (p *Performance) nextTone() {
	for p.tone++; p.tone < len(p.tones); p.tone++ {
		if p.length = int64(math.Round(p.tones[p.tone].Seconds * p.rate)); p.length > 0 {
			p.at = 0
			return
		}
	}
}

// Read fills buf with the next samples; io.EOF after the last tone.
func (p *Performance) Read(buf []float32) (int, error) {
	if p.tone >= len(p.tones) {
		return 0, io.EOF
	}
	n := len(buf)
	if p.realtime {
		n = p.pace(n)
	}
	for i := range n {
		buf[i] = p.sample()
		if p.tone >= len(p.tones) {
			p.emitted += int64(i + 1)
			return i + 1, nil
		}
	}
	p.emitted += int64(n)
	return n, nil
}

// pace waits until at least a device-sized block (or all that is wanted)
// is due by the wall clock and says how many samples may go out.
func (p *Performance) pace(want int) int {
	if p.start.IsZero() {
		p.start = time.Now()
	}
	need := min(int64(want), max(1, int64(pacedBlockSec*p.rate)))
	dueAt := p.start.Add(time.Duration(float64(p.emitted+need) / p.rate * float64(time.Second)))
	time.Sleep(time.Until(dueAt))
	due := int64(time.Since(p.start).Seconds()*p.rate) - p.emitted
	return int(min(int64(want), max(need, due)))
}

// sample synthesises one sample and advances the score.
func (p *Performance) sample() float32 {
	t := p.tones[p.tone]
	sec := float64(p.at) / p.rate
	f := t.Hz
	if t.VibratoCents != 0 && t.VibratoHz > 0 {
		depth := t.VibratoCents * min(1, sec/vibratoOnset)
		f *= math.Exp2(depth * math.Sin(2*math.Pi*t.VibratoHz*sec) / 1200)
	}
	p.breath += 0.25 * (p.whiteNoise() - p.breath)

	var v float64
	if !t.Rest && f > 0 && f < p.rate { // a bad frequency (NaN too) is a rest, not noise
		p.phase += f / p.rate
		p.phase -= math.Floor(p.phase)
		for k, a := range voiceHarmonics {
			if float64(k+1)*f >= p.rate/2 {
				break // above Nyquist it would alias
			}
			v += a * math.Sin(2*math.Pi*float64(k+1)*p.phase)
		}
		v = (v + breathLevel*p.breath) * voiceScale * toneGain(t.Gain) * p.envelope()
	}
	if p.at++; p.at >= p.length {
		p.nextTone()
	}
	return float32(v)
}

// toneGain reads Tone.Gain: 0 is full level, and anything else is held
// to 0..1 (NaN to silence), so no score can go above the ceiling.
func toneGain(g float64) float64 {
	switch {
	case g == 0:
		return 1
	case g > 0:
		return min(1, g)
	}
	return 0
}

// envelope fades each tone in and out with raised-cosine ramps, each at
// most a quarter of the tone, so notes join without clicks.
func (p *Performance) envelope() float64 {
	ramp := func(samples, seconds float64) float64 {
		width := min(seconds*p.rate, float64(p.length)/4)
		if samples >= width {
			return 1
		}
		return 0.5 - 0.5*math.Cos(math.Pi*samples/width)
	}
	return ramp(float64(p.at), attackTime) * ramp(float64(p.length-1-p.at), releaseTime)
}

// whiteNoise is uniform in [-1, 1) from a xorshift generator: the breath
// is the same on every run.
func (p *Performance) whiteNoise() float64 {
	p.noise ^= p.noise << 13
	p.noise ^= p.noise >> 7
	p.noise ^= p.noise << 17
	return float64(p.noise>>11)/(1<<52) - 1
}
