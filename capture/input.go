package capture

import (
	"fmt"
	"time"

	"fifthline/device"
	"fifthline/source"
)

// Errors of the live input, as package device reports them.
var (
	// ErrDeviceLost means the input stopped delivering audio: unplugged,
	// taken by the system, or its sound server gone. What was read before
	// it is good; callers should stop cleanly and keep it.
	ErrDeviceLost = device.ErrInputLost
	// ErrNoDevice means no input device matched the request.
	ErrNoDevice = device.ErrNoInput
)

// PreferredRate is the rate OpenInput asks for when the caller names none.
const PreferredRate = device.PreferredRate

// InputOptions choose the device and how it is read. The zero value reads
// the first channel of the default input device at 48 kHz if it can.
type InputOptions struct {
	// Device is "" for the default input, a PortAudio device index as
	// listed by fifthline devices, or part of a device name (case does
	// not matter).
	Device string
	// Channel is the interface channel to read, counted from 1 as printed
	// on the interface and as the CLI's --channel takes it; 0 means 1.
	Channel int
	// Channels, if given, are several interface channels (counted from 1)
	// read in step with ReadChannels, one player each; Channel is then
	// unused.
	Channels []int
	// StreamChannels opens the stream with this many channels when more
	// than the highest one read (see device.InputOptions); 0 for as many.
	StreamChannels int
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

// Input is a live input (a microphone, an interface's channels) read as a
// source.Source for one channel and a source.Multi for several. The stream
// is package device's: Read, ReadChannels, Stats, Device, SampleRate and
// Close are its. One goroutine reads; Stats and Close may be called from
// any.
type Input struct {
	*device.Input
}

// OpenInput opens and starts an input stream.
func OpenInput(opts InputOptions) (*Input, error) {
	channels := opts.Channels
	if len(channels) == 0 {
		if opts.Channel < 0 {
			return nil, fmt.Errorf("input channel %d requested; channels count from 1", opts.Channel)
		}
		channels = []int{max(opts.Channel, 1)}
	}
	in, err := device.OpenInput(device.InputOptions{
		Device: opts.Device, Channels: channels, StreamChannels: opts.StreamChannels, SampleRate: opts.SampleRate,
		Buffer: opts.Buffer, StallTimeout: opts.StallTimeout,
	})
	if err != nil {
		return nil, err
	}
	return &Input{in}, nil
}

// Channel is the first channel being read, counted from 1.
func (in *Input) Channel() int { return in.Carried()[0] }

var (
	_ source.Source = (*Input)(nil)
	_ source.Multi  = (*Input)(nil)
)
