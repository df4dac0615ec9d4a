package device

import (
	"errors"
	"fmt"
	"os"
	"slices"
	"sync"
	"time"

	"github.com/gordonklaus/portaudio"

	"fifthline/source"
)

// ErrInputLost means the input stopped delivering audio: unplugged, taken
// by the system, or its sound server gone. What was read before it is
// good; callers should stop cleanly and keep it.
var ErrInputLost = errors.New("input device lost")

// InputOptions choose the device, its channels and how they are read. The
// zero value reads the first channel of the default input device at
// 48 kHz if it can.
type InputOptions struct {
	// Device is "" for the default input, a PortAudio device index as
	// listed by Devices, or part of a device name (case does not matter).
	Device string
	// Channel is the interface channel to read, counted from 1 as printed
	// on the interface and as the CLI's --channel takes it; 0 means 1.
	Channel int
	// Channels, if given, are several of the interface's channels (counted
	// from 1) carried in step, in the order ReadChannels delivers them, one
	// player each; Channel is then unused.
	Channels []int
	// StreamChannels is how many channels the stream opens, when more
	// than the highest one carried: a sound server remixes a stream
	// whose channel count differs from its source's, so reading channel 3
	// of a four-channel interface through PulseAudio needs a
	// four-channel stream. 0 opens as many as the highest channel asked.
	StreamChannels int
	// SampleRate is the rate to ask for; 0 means PreferredRate, falling
	// back to the device's default rate.
	SampleRate float64
	// Buffer is how much audio waits for a slow reader before blocks are
	// dropped; 0 means 2 s.
	Buffer time.Duration
	// StallTimeout is how long a read waits for audio before it reports
	// ErrInputLost; 0 means 2 s (StallTimeout). The first block may take
	// up to 5 s (StartGrace).
	StallTimeout time.Duration
}

// ChannelsError is an input asked for more channels than it has (counted
// as its sound server's source has them, where one serves it).
type ChannelsError struct {
	Input   string // what is listened to (Input.Heard)
	Has     int
	Channel int // the channel asked for beyond them, or
	Stream  int // the stream's channel count asked for
}

func (e *ChannelsError) Error() string {
	has := fmt.Sprintf("%d channels", e.Has)
	if e.Has == 1 {
		has = "one channel"
	}
	if e.Stream > 0 {
		return fmt.Sprintf("input %s has %s; a stream of %d requested", e.Input, has, e.Stream)
	}
	return fmt.Sprintf("input %s has %s; channel %d requested", e.Input, has, e.Channel)
}

// Input is a live PortAudio input stream carrying one or more channels in
// step. It is a source.Multi, and a source.Source when it carries one
// channel. One goroutine reads; Stats and Close may be called from any.
type Input struct {
	*stream
	channels []int // carried, counted from 1
	served   Served
	stall    time.Duration
	one      [1][]float32 // Read's single destination, kept to spare an allocation
	done     chan struct{}
	clock    sync.Mutex // StreamTime asks the stream, so not while it closes
	closing  sync.Once
	closeErr error
}

// OpenInput opens and starts an input stream.
func OpenInput(opt InputOptions) (*Input, error) {
	in := &Input{
		channels: slices.Clone(opt.Channels),
		stall:    orDefault(opt.StallTimeout, StallTimeout),
		done:     make(chan struct{}),
	}
	if len(in.channels) == 0 {
		if opt.Channel < 0 {
			return nil, fmt.Errorf("input channel %d requested; channels count from 1", opt.Channel)
		}
		in.channels = []int{max(opt.Channel, 1)}
	}
	pick := make([]int, len(in.channels))
	st, err := open(streamSpec{
		dir: input, device: opt.Device, rate: opt.SampleRate,
		channels: func(dev *portaudio.DeviceInfo) (int, error) {
			// A sound server would remix a stream of more channels than
			// its source has out of the ones it has, without a word.
			in.served, _ = servedSource(deviceInfo(dev, nil, nil))
			has := dev.MaxInputChannels
			if in.served.Channels > 0 {
				has = min(has, in.served.Channels)
			}
			short := &ChannelsError{Input: in.served.heard(dev.Name), Has: has}
			if opened := opt.StreamChannels; opened > has {
				short.Stream = opened
				return 0, short
			}
			opened := opt.StreamChannels
			for i, c := range in.channels {
				if c < 1 || c > has {
					short.Channel = c
					return 0, short
				}
				pick[i], opened = c-1, max(opened, c)
			}
			return opened, nil
		},
		ring: func(rate float64, channels, fd int) (*ring, error) {
			frames := max(2*Block, int(rate*orDefault(opt.Buffer, 2*time.Second).Seconds()))
			q, err := newRing(frames, channels, pick, fd)
			if err == nil {
				q.markDelivery(time.Now().UnixNano()) // the start-up grace runs from here
			}
			return q, err
		},
	})
	if err != nil {
		return nil, err
	}
	in.stream = st
	return in, nil
}

// orDefault is v, or def when v is zero.
func orDefault[T comparable](v, def T) T {
	var zero T
	if v == zero {
		return def
	}
	return v
}

// Read fills p with the one channel carried, as a source.Source; an input
// carrying several channels is read with ReadChannels.
func (in *Input) Read(p []float32) (int, error) {
	if len(in.channels) != 1 {
		return 0, fmt.Errorf("%s carries %d channels: read them with ReadChannels", in.what, len(in.channels))
	}
	in.one[0] = p
	n, err := in.ReadChannels(in.one[:])
	in.one[0] = nil
	return n, err
}

// ReadChannels waits for audio and fills dst[c] with channel Channels()[c]
// of what has arrived, the same number of frames in each; len(dst) must be
// the number of channels carried. After the stall timeout without a block
// from the device it returns ErrInputLost.
func (in *Input) ReadChannels(dst [][]float32) (int, error) {
	if len(dst) != len(in.channels) {
		return 0, fmt.Errorf("%s: %d destinations for %d channels", in.what, len(dst), len(in.channels))
	}
	for {
		select {
		case <-in.done:
			return 0, fmt.Errorf("%s: read after close: %w", in.what, os.ErrClosed)
		default:
		}
		if n := in.ring.readChannels(dst); n > 0 || slices.ContainsFunc(dst, func(d []float32) bool { return len(d) == 0 }) {
			return n, nil
		}
		limit := in.stall
		if in.ring.blocks() == 0 {
			limit = max(limit, StartGrace)
		}
		deadline := time.Unix(0, in.ring.lastBlock()).Add(limit)
		if time.Until(deadline) <= 0 {
			return 0, fmt.Errorf("%w: %q delivered no audio for %v", ErrInputLost, in.info.Name, limit)
		}
		// Say we are about to sleep, then look once more: a block that
		// lands in between either is seen here or sends a wake-up.
		in.ring.waiting(true)
		if n := in.ring.readChannels(dst); n > 0 {
			in.ring.waiting(false)
			return n, nil
		}
		if err := in.wake.Wait(deadline); err != nil && !errors.Is(err, os.ErrDeadlineExceeded) {
			select {
			case <-in.done:
			default:
				return 0, fmt.Errorf("%s: wake-up pipe: %w", in.what, err)
			}
		}
	}
}

// Close stops the stream and releases PortAudio; a read waiting in another
// goroutine returns. Closing twice is harmless.
func (in *Input) Close() error {
	in.closing.Do(func() {
		in.clock.Lock()
		defer in.clock.Unlock()
		close(in.done)
		in.closeErr = in.stream.close(true)
	})
	return in.closeErr
}

// SampleRate is the rate the device delivers, in Hz.
func (in *Input) SampleRate() float64 { return in.rate }

// Channels is how many channels each read delivers.
func (in *Input) Channels() int { return len(in.channels) }

// Carried are the interface's channels read, counted from 1, in the order
// ReadChannels delivers them.
func (in *Input) Carried() []int { return slices.Clone(in.channels) }

// Device describes the device being read.
func (in *Input) Device() Info { return in.info }

// Served is the sound server's source behind the device; its Name is ""
// where no server serves it or none could be asked.
func (in *Input) Served() Served { return in.served }

// Heard names what is listened to for a musician: the device's name and,
// where a sound server serves it, the source behind it.
func (in *Input) Heard() string { return in.served.heard(in.info.Name) }

// Backlog is how much audio has arrived and waits to be read: near zero
// while the reader keeps up.
func (in *Input) Backlog() time.Duration {
	return time.Duration(float64(in.ring.backlog()/len(in.channels)) / in.rate * float64(time.Second))
}

// Stats reports what happened to the audio so far.
func (in *Input) Stats() source.InputStats { return in.ring.stats() }

var (
	_ source.Source = (*Input)(nil)
	_ source.Multi  = (*Input)(nil)
)
