package capture

import (
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

// InputOptions choose the device and its channels, and how they are read.
type InputOptions = device.InputOptions

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
	in, err := device.OpenInput(opts)
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
