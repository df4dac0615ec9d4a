package capture

import (
	"errors"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/gordonklaus/portaudio"
)

// ErrDeviceLost means the input stopped delivering audio: unplugged,
// taken by the system, or its sound server gone. What was read before it
// is good; callers should stop cleanly and keep it.
var ErrDeviceLost = errors.New("input device lost")

// PreferredRate is the rate OpenInput asks for when the caller names none.
const PreferredRate = 48000

// ClipLevel is the magnitude counted as clipping: within 0.01 dB of full scale.
const ClipLevel = 0.999

// startGrace is how long a device may take to deliver its first block: a
// sound server may be waking an idle device (PulseAudio's null sink takes
// up to 2 s).
const startGrace = 5 * time.Second

// framesPerBlock is the PortAudio callback size: about 10 ms at 48 kHz.
const framesPerBlock = 512

// InputOptions choose the device and how it is read. The zero value reads
// the first channel of the default input device at 48 kHz if it can.
type InputOptions struct {
	// Device is "" for the default input, a PortAudio device index as
	// listed by Devices, or part of a device name (case does not matter).
	Device string
	// Channel is the interface channel to read, counted from 1 as printed
	// on the interface and as the CLI's --channel takes it; 0 means 1.
	Channel int
	// SampleRate is the rate to ask for; 0 means PreferredRate, falling
	// back to the device's default rate.
	SampleRate float64
	// Buffer is how much audio waits for a slow reader before blocks are
	// dropped; 0 means 2 s.
	Buffer time.Duration
	// StallTimeout is how long Read waits for audio before it reports
	// ErrDeviceLost; 0 means 2 s. The first block may take up to 5 s.
	StallTimeout time.Duration
}

// InputStats counts what happened to the audio since the stream opened.
type InputStats struct {
	Blocks         uint64  // blocks the device delivered
	Overflows      uint64  // blocks PortAudio flagged: the driver lost input before we saw it
	DroppedBlocks  uint64  // blocks thrown away because the reader fell Buffer behind
	DroppedSamples uint64  // samples in those blocks
	Peak           float32 // largest magnitude of the channel read, 0..1
	Clipped        uint64  // samples at or above ClipLevel
}

// PeakDBFS is Peak in decibels relative to full scale (-Inf for silence).
func (s InputStats) PeakDBFS() float64 { return 20 * math.Log10(float64(s.Peak)) }

// Input is a live PortAudio input stream read as a Source. One goroutine
// reads; Stats and Close may be called from any.
type Input struct {
	device   DeviceInfo
	rate     float64
	channel  int // 1-based
	channels int // opened on the stream
	stall    time.Duration
	stream   *CStream
	release  func()
	ring     *ring
	wake     *WakePipe // the audio thread wakes a waiting Read through it
	done     chan struct{}
	closing  sync.Once
	closeErr error
}

// OpenInput opens and starts an input stream.
func OpenInput(opts InputOptions) (*Input, error) {
	release, err := InitPortAudio()
	if err != nil {
		return nil, err
	}
	in, err := openInput(opts)
	if err != nil {
		release()
		return nil, err
	}
	in.release = release
	return in, nil
}

func openInput(opts InputOptions) (*Input, error) {
	dev, defIn, err := pickDevice(opts.Device)
	if err != nil {
		return nil, err
	}
	channel := max(opts.Channel, 1)
	if opts.Channel < 0 || channel > dev.MaxInputChannels {
		return nil, fmt.Errorf("input %q has %d channel(s); channel %d requested", dev.Name, dev.MaxInputChannels, opts.Channel)
	}
	in := &Input{
		device:   deviceInfo(dev, defIn, nil),
		channel:  channel,
		channels: channel,
		stall:    orDefault(opts.StallTimeout, 2*time.Second),
		done:     make(chan struct{}),
	}
	p := portaudio.HighLatencyParameters(dev, nil)
	p.Input.Channels = channel
	p.FramesPerBuffer = framesPerBlock
	err = QuietStderr(func() error {
		// The format is what matters here: the callback itself is C's.
		if err := NegotiateRate(&p, opts.SampleRate, dev.DefaultSampleRate, func([]float32) {}, fmt.Sprintf("input %q", dev.Name)); err != nil {
			return err
		}
		in.rate = p.SampleRate
		if err := in.openRing(max(2*framesPerBlock, int(in.rate*orDefault(opts.Buffer, 2*time.Second).Seconds()))); err != nil {
			return fmt.Errorf("input %q: %w", dev.Name, err)
		}
		if in.stream, err = openStream(p, in.ring); err != nil {
			in.wake.Close()
			return fmt.Errorf("input %q: %w", dev.Name, err)
		}
		if err := in.stream.Start(); err != nil {
			in.stream.Close()
			in.wake.Close()
			return fmt.Errorf("input %q: start: %w", dev.Name, err)
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	return in, nil
}

// openRing makes the ring and the pipe through which the audio thread
// wakes a waiting Read.
func (in *Input) openRing(capacity int) error {
	wake, err := NewWakePipe()
	if err != nil {
		return err
	}
	q, err := newRing(capacity, in.channels, in.channel-1, wake.W)
	if err != nil {
		wake.Close()
		return err
	}
	in.ring, in.wake = q, wake
	// The start-up grace runs from here.
	q.markDelivery(time.Now().UnixNano())
	return nil
}

// orDefault is v, or def when v is zero.
func orDefault[T comparable](v, def T) T {
	var zero T
	if v == zero {
		return def
	}
	return v
}

// pickDevice resolves InputOptions.Device to an input-capable device; it
// also says which device is the default input, if any.
func pickDevice(want string) (found, defIn *portaudio.DeviceInfo, err error) {
	err = QuietStderr(func() error {
		var err error
		defIn, err = portaudio.DefaultInputDevice()
		if want == "" {
			if err != nil || defIn == nil {
				return fmt.Errorf("%w: no default input device (%v)", ErrNoDevice, err)
			}
			found = defIn
			return nil
		}
		devs, err := portaudio.Devices()
		if err != nil {
			return fmt.Errorf("portaudio: listing devices: %w", err)
		}
		found, err = matchDevice(devs, want)
		return err
	})
	return found, defIn, err
}

// matchDevice finds an input by index, exact name or a unique part of one.
func matchDevice(devs []*portaudio.DeviceInfo, want string) (*portaudio.DeviceInfo, error) {
	var parts []*portaudio.DeviceInfo
	idx, isIndex := strconv.Atoi(want)
	for _, d := range devs {
		switch {
		case d.MaxInputChannels < 1:
			continue
		case isIndex == nil && d.Index == idx, strings.EqualFold(d.Name, want):
			return d, nil
		case strings.Contains(strings.ToLower(d.Name), strings.ToLower(want)):
			parts = append(parts, d)
		}
	}
	switch len(parts) {
	case 1:
		return parts[0], nil
	case 0:
		return nil, fmt.Errorf("%w %q (fifthline devices lists them)", ErrNoDevice, want)
	}
	names := make([]string, len(parts))
	for i, d := range parts {
		names[i] = strconv.Quote(d.Name)
	}
	return nil, fmt.Errorf("input device %q is ambiguous: it matches %s", want, strings.Join(names, ", "))
}

// Read waits for audio and fills p with what has arrived. After
// StallTimeout without a block from the device it returns ErrDeviceLost.
func (in *Input) Read(p []float32) (int, error) {
	for {
		select {
		case <-in.done:
			return 0, fmt.Errorf("input %q: read after close: %w", in.device.Name, os.ErrClosed)
		default:
		}
		if len(p) == 0 {
			return 0, nil
		}
		if n := in.ring.read(p); n > 0 {
			return n, nil
		}
		limit := in.stall
		if in.ring.blocks() == 0 {
			limit = max(limit, startGrace)
		}
		deadline := time.Unix(0, in.ring.lastBlock()).Add(limit)
		if time.Until(deadline) <= 0 {
			return 0, fmt.Errorf("%w: %q delivered no audio for %v", ErrDeviceLost, in.device.Name, limit)
		}
		// Say we are about to sleep, then look once more: a block that
		// lands in between either is seen here or sends a wake-up.
		in.ring.waiting(true)
		if n := in.ring.read(p); n > 0 {
			in.ring.waiting(false)
			return n, nil
		}
		if err := in.wake.Wait(deadline); err != nil && !errors.Is(err, os.ErrDeadlineExceeded) {
			select {
			case <-in.done:
			default:
				return 0, fmt.Errorf("input %q: wake-up pipe: %w", in.device.Name, err)
			}
		}
	}
}

// Close stops the stream and releases PortAudio; a Read waiting in another
// goroutine returns. Closing twice is harmless.
func (in *Input) Close() error {
	in.closing.Do(func() {
		close(in.done)
		in.closeErr = CloseStream(in.stream, true, in.release, fmt.Sprintf("input %q", in.device.Name))
		if in.closeErr == nil {
			in.wake.Close()
		} else {
			// The audio thread may still write to the ring and pipe:
			// keep both for the life of the process.
			leaked.Store(in.ring)
			in.wake.Interrupt() // a waiting Read returns
		}
	})
	return in.closeErr
}

// leaked holds the ring of a stream that would not close.
var leaked atomic.Pointer[ring]

// SampleRate is the rate the device delivers, in Hz.
func (in *Input) SampleRate() float64 { return in.rate }

// Device describes the device being read.
func (in *Input) Device() DeviceInfo { return in.device }

// Channel is the channel being read, counted from 1.
func (in *Input) Channel() int { return in.channel }

// Stats reports what happened to the audio so far.
func (in *Input) Stats() InputStats { return in.ring.stats() }
