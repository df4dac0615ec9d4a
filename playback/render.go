package playback

import (
	"errors"
	"fmt"
	"os"
	"time"
)

// The renderer: a goroutine that keeps the output ring (capture.OutputRing) topped up
// with the mixer's sound, and notices when the device stops taking it.

// ErrOutputLost means the output stopped taking sound: unplugged, taken by
// the system, or its sound server gone.
var ErrOutputLost = errors.New("output device lost")

// Output loss: the device asks for sound every few tens of milliseconds;
// silence from it for outputStall (outputGrace at the start, while a sound
// server wakes an idle device) means it has gone.
const (
	outputStall = 2 * time.Second
	outputGrace = 5 * time.Second
)

// Lost reports ErrOutputLost, naming the device, once the output has
// stopped asking for sound; nil while it plays.
func (p *Player) Lost() error {
	if e := p.lost.Load(); e != nil {
		return *e
	}
	return nil
}

// renderAhead keeps the ring topped up until everything has faded out
// after Close asked for it, or the pipe is closed; it notices the device
// going away.
func (p *Player) renderAhead(block int) {
	defer close(p.rendered)
	buf := make([]float32, block)
	played, since, limit := p.ring.Played(), time.Now(), outputGrace
	for !p.silent.Load() && !p.closed.Load() {
		if n := p.ring.Played(); n != played {
			played, since, limit = n, time.Now(), outputStall
		} else if time.Since(since) > limit && p.lost.Load() == nil {
			err := fmt.Errorf("%w: %q took no sound for %v", ErrOutputLost, p.device.Name, limit)
			p.lost.Store(&err)
		}
		p.ring.Waiting(true)
		if p.ring.Fill()+block <= p.ring.Cap() {
			p.ring.Waiting(false)
			p.topUp(buf)
			continue
		}
		// A second's deadline: a device that stopped asking must not
		// leave the renderer asleep for ever.
		if err := p.wake.Wait(time.Now().Add(time.Second)); err != nil && !errors.Is(err, os.ErrDeadlineExceeded) {
			return
		}
	}
}

// topUp renders blocks while the ring has room for them.
func (p *Player) topUp(buf []float32) {
	for p.ring.Fill()+len(buf) <= p.ring.Cap() && !p.silent.Load() {
		p.render(buf)
		p.ring.Write(buf)
	}
}

// render mixes the next block: it takes what the methods handed over and
// never blocks or allocates.
func (p *Player) render(out []float32) {
	if v := p.droneIn.Swap(nil); v != nil && !p.stopped {
		if p.drone != nil {
			p.drone.Release()
		}
		p.drone = v
		p.mix.Add(v)
	}
	if v := p.refIn.Swap(nil); v != nil && !p.stopped {
		if p.ref != nil {
			p.ref.Release()
		}
		p.ref = v
		p.mix.Add(v)
	}
	if p.stopping.Load() && !p.stopped {
		p.stopped = true
		p.mix.ReleaseAll()
	}
	p.mix.Render(out, p.channels)
	if p.stopped && p.mix.Silent() {
		p.silent.Store(true)
	}
}

// Underruns counts the audio callbacks that found too little rendered and
// played silence (a click): zero unless the machine is overloaded.
func (p *Player) Underruns() uint64 { return p.ring.Underruns() }
