package playback

import (
	"fmt"
	"slices"
	"sync"
	"sync/atomic"
	"time"

	"fifthline/device"
	"fifthline/drone"
)

// Hearing safety (team rule 4): sound starts quietly and is capped.
const (
	// DefaultLevel is the peak of everything sounding together, in dBFS,
	// when Options.Level is 0.
	DefaultLevel = -18.0
	// MaxLevel is the loudest level a Player accepts, in dBFS.
	MaxLevel = -6.0
	// DefaultFade is the raised-cosine fade in and out of a drone.
	DefaultFade = 500 * time.Millisecond
	// referenceFade is the fade of a reference tone: short enough for a
	// brief tone, long enough to be click-free.
	referenceFade = 40 * time.Millisecond
)

// ErrTooLoud means a level above MaxLevel was asked for.
var ErrTooLoud = fmt.Errorf("level above the %g dBFS limit", MaxLevel)

// Options choose the device, level and sound. The zero value plays pure
// tones at DefaultLevel on the default output.
type Options struct {
	// Device is "" for the default output, a PortAudio device index as
	// fifthline devices lists it, or part of a device name.
	Device string
	// Level is the peak of all notes together, in dBFS (≤ MaxLevel); 0
	// means DefaultLevel. A limiter holds the output to it whatever plays.
	Level float64
	// Timbre of drones and reference tones; the zero value is drone.Pure.
	Timbre drone.Timbre
	// Fade is the drone's fade in and out; 0 means DefaultFade.
	Fade time.Duration
	// ShareWithReference gives drones and reference tones half the level's
	// amplitude each, so that the two together reach it and the limiter
	// never has to act; otherwise a drone alone reaches the level.
	ShareWithReference bool
	// SampleRate to ask for; 0 means 48 kHz, else the device's default.
	SampleRate float64
}

// CheckLevel reports whether a level in dBFS may be played.
func CheckLevel(dbfs float64) error {
	if !(dbfs <= MaxLevel) {
		return fmt.Errorf("%w: %g dBFS", ErrTooLoud, dbfs)
	}
	return nil
}

// Player sounds drones and reference tones on one output stream. Its
// methods may be called from any goroutine.
type Player struct {
	opt      Options
	peak     float64 // linear level of one drone or reference
	out      *device.Output
	rendered chan struct{} // closed when the renderer has stopped

	// Hand-offs to the renderer: the next drone voice (or silence), the
	// next reference tone, and the request to fade everything out.
	droneIn, refIn atomic.Pointer[drone.Voice]
	stopping       atomic.Bool
	silent         atomic.Bool // everything has faded out after stopping
	closed         atomic.Bool // the stream is closed: stop rendering

	// Renderer-only state.
	mix        *drone.Mixer
	drone, ref *drone.Voice
	stopped    bool

	mu       sync.Mutex
	dronePs  []drone.Partial
	refPs    []drone.Partial
	refUntil time.Time
	fades    [4]fadeSpan // the drone's latest fade, the reference's two, the last underrun's
	underrun uint64      // underruns seen by Fading
	closing  sync.Once
	closeErr error
}

// The renderer keeps up to aheadBlocks rendered ahead of the speaker and
// is woken when fewer than lowBlocks wait: PulseAudio asks for 2048 frames
// at a time, and the renderer must never leave it short. The sound is
// that much later (about 64–85 ms), well inside fadeLatency; on a machine
// too busy to keep that lead the output lengthens it (device.Output), and
// the fades are heard that much later again.
const (
	aheadBlocks = 8
	lowBlocks   = 6
)

// NewPlayer opens and starts an output stream; it is silent until SetDrone
// or Reference.
func NewPlayer(opt Options) (*Player, error) {
	if opt.Level == 0 {
		opt.Level = DefaultLevel
	}
	if err := CheckLevel(opt.Level); err != nil {
		return nil, err
	}
	if opt.Timbre.Amps == nil {
		opt.Timbre = drone.Pure
	}
	if opt.Fade <= 0 {
		opt.Fade = DefaultFade
	}
	out, err := device.OpenOutput(device.OutputOptions{
		Device: opt.Device, SampleRate: opt.SampleRate, Ahead: aheadBlocks, Low: lowBlocks,
	})
	if err != nil {
		return nil, err
	}
	p := &Player{opt: opt, out: out, peak: drone.Linear(opt.Level), rendered: make(chan struct{})}
	if opt.ShareWithReference {
		p.peak /= 2
	}
	p.mix = drone.NewMixer(out.SampleRate(), drone.Linear(opt.Level))
	go p.renderAhead(device.Block * out.Channels())
	return p, nil
}

// SetDrone fades the present drone out and a drone on the given
// fundamentals (hertz: a tonic, and perhaps its fifth) in; none fades the
// drone out.
func (p *Player) SetDrone(hz []float64) {
	ps := p.partials(hz)
	p.mu.Lock()
	p.dronePs = ps
	p.mu.Unlock()
	fade := int(p.opt.Fade.Seconds() * p.out.SampleRate())
	now := time.Now()
	p.mu.Lock()
	p.fades[0] = p.span(now, p.opt.Fade)
	p.mu.Unlock()
	p.droneIn.Store(drone.NewVoice(p.out.SampleRate(), ps, fade, fade, 0))
}

// Reference sounds a tone at hz for about dur (fades included), over the
// drone, for a player to hear the note's target; a new one replaces it.
func (p *Player) Reference(hz float64, dur time.Duration) {
	ps := p.partials([]float64{hz})
	fade := int(referenceFade.Seconds() * p.out.SampleRate())
	hold := max(int(dur.Seconds()*p.out.SampleRate())-fade, fade)
	now := time.Now()
	p.mu.Lock()
	p.refPs, p.refUntil = ps, now.Add(dur+p.out.LeadGrowth())
	p.fades[1], p.fades[2] = p.span(now, referenceFade), p.span(now.Add(dur-referenceFade), referenceFade)
	p.mu.Unlock()
	p.refIn.Store(drone.NewVoice(p.out.SampleRate(), ps, fade, fade, hold))
}

func (p *Player) partials(hz []float64) []drone.Partial {
	hz = slices.DeleteFunc(slices.Clone(hz), func(f float64) bool { return !(f > 0) })
	if len(hz) == 0 {
		return nil
	}
	return drone.Partials(hz, p.opt.Timbre, p.peak, p.out.SampleRate())
}

// Partials are the frequencies sounding now: the drone's partials and,
// while it lasts, the reference tone's. Hand them to drone.Cancel (or its
// Follow) so the meter does not hear the player's own drone.
func (p *Player) Partials() []float64 {
	p.mu.Lock()
	defer p.mu.Unlock()
	hz := drone.Frequencies(p.dronePs)
	if time.Now().Before(p.refUntil) {
		for _, f := range drone.Frequencies(p.refPs) {
			if !slices.Contains(hz, f) {
				hz = append(hz, f)
			}
		}
	}
	slices.Sort(hz)
	return hz
}

// fadeSpan is when a fade is heard: from its start to its end plus
// fadeLatency, for the way from the output to the microphone.
type fadeSpan struct{ from, to time.Time }

// fadeLatency allows for output and input buffering between a fade leaving
// the player and reaching the canceller.
const fadeLatency = 250 * time.Millisecond

func (p *Player) span(start time.Time, fade time.Duration) fadeSpan {
	return fadeSpan{start, start.Add(fade + fadeLatency + p.out.LeadGrowth())}
}

// Fading reports whether a drone or reference tone is fading in or out at
// the microphone now, so that drone.Cancel follows its level closely
// meanwhile (and only meanwhile: at other times a loud note must not be
// taken for a fade).
//
// An underrun is a fade too: the sound stops for a moment and comes back,
// so on a machine too busy to render in time the canceller follows it.
func (p *Player) Fading() bool {
	now := time.Now()
	p.mu.Lock()
	defer p.mu.Unlock()
	if u := p.out.Underruns(); u != p.underrun {
		p.underrun, p.fades[3] = u, p.span(now, referenceFade)
	}
	for _, f := range p.fades {
		if !now.Before(f.from) && now.Before(f.to) {
			return true
		}
	}
	return false
}

// Level is the output's peak ceiling in dBFS.
func (p *Player) Level() float64 { return p.opt.Level }

// SampleRate is the stream's rate in Hz.
func (p *Player) SampleRate() float64 { return p.out.SampleRate() }

// Device describes the output device.
func (p *Player) Device() device.Info { return p.out.Device() }

// Close fades everything out (waiting for the fade, at most a second more
// than it should take), then stops the stream and releases PortAudio.
// Closing twice is harmless.
func (p *Player) Close() error {
	p.closing.Do(func() {
		p.stopping.Store(true)
		// The fade renders ahead within a block; then the ring, which
		// holds its end, drains to the speaker.
		deadline := time.Now().Add(p.opt.Fade + time.Second)
		drained := func() bool { return p.silent.Load() && p.out.Fill() == 0 }
		for !drained() && p.Lost() == nil && time.Now().Before(deadline) {
			time.Sleep(5 * time.Millisecond)
		}
		// Stop, not abort, when the fade is out: what the device buffers is
		// its end. A device that stopped playing would never finish a stop.
		abort := !drained() || p.Lost() != nil
		p.closeErr = p.out.Close(abort)
		p.closed.Store(true)
		<-p.rendered
	})
	return p.closeErr
}

// ErrNoDevice means no output device matched the request.
var ErrNoDevice = device.ErrNoOutput
