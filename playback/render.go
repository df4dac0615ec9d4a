package playback

import "fifthline/device"

// The renderer: a goroutine that keeps the output's ring topped up with
// the mixer's sound; the output itself notices when the device stops
// taking it.

// ErrOutputLost means the output stopped taking sound: unplugged, taken by
// the system, or its sound server gone.
var ErrOutputLost = device.ErrOutputLost

// Lost reports ErrOutputLost, naming the device, once the output has
// stopped asking for sound; nil while it plays.
func (p *Player) Lost() error { return p.out.Lost() }

// renderAhead keeps the ring topped up until everything has faded out
// after Close asked for it, or the stream is closed.
func (p *Player) renderAhead(block int) {
	defer close(p.rendered)
	buf := make([]float32, block)
	for !p.silent.Load() && !p.closed.Load() && p.out.AwaitRoom(block) {
		p.topUp(buf)
	}
}

// topUp renders blocks while the ring has room for them.
func (p *Player) topUp(buf []float32) {
	for p.out.Fill()+len(buf) <= p.out.Cap() && !p.silent.Load() {
		p.render(buf)
		p.out.Write(buf)
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
	p.mix.Render(out, p.out.Channels())
	if p.stopped && p.mix.Silent() {
		p.silent.Store(true)
	}
}

// Underruns counts the audio callbacks that found too little rendered and
// played silence (a click): zero unless the machine is overloaded.
func (p *Player) Underruns() uint64 { return p.out.Underruns() }
