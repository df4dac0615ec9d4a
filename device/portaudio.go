package device

import (
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"
	"sync"

	"github.com/gordonklaus/portaudio"
	"golang.org/x/sys/unix"
)

// shared is a resource that starts with its first holder and stops after
// its last.
type shared struct {
	mu      sync.Mutex
	holders int
}

// hold starts the resource unless it is held already; release, which may be
// called more than once, stops it when the last holder lets go.
func (s *shared) hold(start func() error, stop func()) (release func(), err error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.holders == 0 {
		if err := start(); err != nil {
			return nil, err
		}
	}
	s.holders++
	var once sync.Once
	return func() {
		once.Do(func() {
			s.mu.Lock()
			defer s.mu.Unlock()
			if s.holders--; s.holders == 0 {
				stop()
			}
		})
	}, nil
}

// PortAudio, ALSA and JACK print start-up chatter straight to file
// descriptor 2, below Go's os.Stderr, where it would garble a full-screen
// meter or a --plain CSV session.
var (
	muted       shared
	savedStderr int
)

// MuteStderr points file descriptor 2 (C libraries and Go alike) at
// /dev/null until restore is called; holders nest. Hold it for a whole
// screen session, or use QuietStderr around a single call.
//
// With FIFTHLINE_AUDIO_DEBUG set in the environment nothing is muted, so
// the libraries' messages can be read when a device misbehaves.
func MuteStderr() (restore func(), err error) {
	if os.Getenv("FIFTHLINE_AUDIO_DEBUG") != "" {
		return func() {}, nil
	}
	return muted.hold(func() error {
		null, err := unix.Open(os.DevNull, unix.O_WRONLY|unix.O_CLOEXEC, 0)
		if err != nil {
			return fmt.Errorf("mute stderr: %w", err)
		}
		defer unix.Close(null)
		if savedStderr, err = unix.Dup(2); err != nil {
			return fmt.Errorf("mute stderr: %w", err)
		}
		if err := unix.Dup2(null, 2); err != nil {
			unix.Close(savedStderr)
			return fmt.Errorf("mute stderr: %w", err)
		}
		return nil
	}, func() {
		_ = unix.Dup2(savedStderr, 2)
		unix.Close(savedStderr)
	})
}

// QuietStderr runs f with file descriptor 2 muted. If muting fails, f runs
// anyway: noise is better than no sound.
func QuietStderr(f func() error) error {
	if restore, err := MuteStderr(); err == nil {
		defer restore()
	}
	return f()
}

var portAudio shared

// initPortAudio initialises PortAudio quietly; every stream and every
// device listing holds it, and the last release terminates PortAudio.
// Release is safe to call more than once. (Streams are opened in C, never
// through the binding, whose stream numbering needs working around.)
func initPortAudio() (release func(), err error) {
	return portAudio.hold(func() error {
		// Never let libjack start a server of its own: it is slow and noisy.
		if os.Getenv("JACK_NO_START_SERVER") == "" {
			os.Setenv("JACK_NO_START_SERVER", "1")
		}
		if err := QuietStderr(portaudio.Initialize); err != nil {
			return fmt.Errorf("portaudio: %w", err)
		}
		return nil
	}, func() { _ = QuietStderr(portaudio.Terminate) })
}

// Info describes one audio device as PortAudio sees it.
type Info struct {
	Index          int
	Name           string
	HostAPI        string
	InputChannels  int
	OutputChannels int
	DefaultRate    float64
	DefaultInput   bool // the system's default input device
	DefaultOutput  bool // the system's default output device
}

// Devices lists the audio devices, defaults marked.
func Devices() ([]Info, error) {
	release, err := initPortAudio()
	if err != nil {
		return nil, err
	}
	defer release()
	var list []Info
	err = QuietStderr(func() error {
		devs, err := portaudio.Devices()
		if err != nil {
			return fmt.Errorf("portaudio: listing devices: %w", err)
		}
		in, _ := portaudio.DefaultInputDevice() // none is not an error here
		out, _ := portaudio.DefaultOutputDevice()
		for _, d := range devs {
			list = append(list, deviceInfo(d, in, out))
		}
		return nil
	})
	return list, err
}

func deviceInfo(d, defIn, defOut *portaudio.DeviceInfo) Info {
	info := Info{
		Index:          d.Index,
		Name:           d.Name,
		InputChannels:  d.MaxInputChannels,
		OutputChannels: d.MaxOutputChannels,
		DefaultRate:    d.DefaultSampleRate,
		DefaultInput:   defIn != nil && d.Index == defIn.Index,
		DefaultOutput:  defOut != nil && d.Index == defOut.Index,
	}
	if d.HostApi != nil {
		info.HostAPI = d.HostApi.Name
	}
	return info
}

// Errors of device choice: nothing matched the request for an input or an
// output (fifthline devices lists them).
var (
	ErrNoInput  = errors.New("no such input device")
	ErrNoOutput = errors.New("no such output device")
)

// direction is an input or an output, for choosing a device.
type direction struct {
	input    bool
	name     string // "input" or "output"
	channels func(*portaudio.DeviceInfo) int
	byDef    func() (*portaudio.DeviceInfo, error)
	none     error
}

var (
	input = direction{true, "input", func(d *portaudio.DeviceInfo) int { return d.MaxInputChannels },
		portaudio.DefaultInputDevice, ErrNoInput}
	output = direction{false, "output", func(d *portaudio.DeviceInfo) int { return d.MaxOutputChannels },
		portaudio.DefaultOutputDevice, ErrNoOutput}
)

// pick resolves a request ("" for the default, a PortAudio index, an exact
// name or a unique part of one) to a device for dir; it also says which
// device is dir's default, if any. Call it with PortAudio held, quietly.
func (dir direction) pick(want string) (found, def *portaudio.DeviceInfo, err error) {
	def, err = dir.byDef()
	if want == "" {
		if err != nil || def == nil {
			return nil, nil, fmt.Errorf("%w: no default %s device (%v)", dir.none, dir.name, err)
		}
		return def, def, nil
	}
	devs, err := portaudio.Devices()
	if err != nil {
		return nil, nil, fmt.Errorf("portaudio: listing devices: %w", err)
	}
	var parts []*portaudio.DeviceInfo
	idx, isIndex := strconv.Atoi(want)
	for _, d := range devs {
		switch {
		case dir.channels(d) < 1:
		case isIndex == nil && d.Index == idx, strings.EqualFold(d.Name, want):
			return d, def, nil
		case strings.Contains(strings.ToLower(d.Name), strings.ToLower(want)):
			parts = append(parts, d)
		}
	}
	switch len(parts) {
	case 1:
		return parts[0], def, nil
	case 0:
		return nil, nil, fmt.Errorf("%w %q (fifthline devices lists them)", dir.none, want)
	}
	names := make([]string, len(parts))
	for i, d := range parts {
		names[i] = strconv.Quote(d.Name)
	}
	return nil, nil, fmt.Errorf("%s device %q is ambiguous: it matches %s", dir.name, want, strings.Join(names, ", "))
}
