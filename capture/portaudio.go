package capture

import (
	"errors"
	"fmt"
	"os"
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

// NegotiateRate sets p.SampleRate to the first rate the device supports for
// this stream: want if given, else PreferredRate, else the device's own
// default. The error names the last rate tried; what names the stream.
func NegotiateRate(p *portaudio.StreamParameters, want, deviceDefault float64, callback any, what string) error {
	rates := []float64{want}
	if want == 0 {
		rates = []float64{PreferredRate, deviceDefault}
	}
	var err error
	for _, r := range rates {
		p.SampleRate = r
		if err = portaudio.IsFormatSupported(*p, callback); err == nil {
			return nil
		}
	}
	return fmt.Errorf("%s cannot run at %v Hz: %w", what, rates[len(rates)-1], err)
}

// Stream is what CloseStream ends: a binding's stream or the input's own.
type Stream interface {
	Stop() error
	Abort() error
	Close() error
}

// CloseStream ends a stream quietly and releases this user's share of
// PortAudio: abort drops what is buffered (an input), otherwise the stream
// plays it out first (an output's last fade). what names the stream in the
// error ("input \"name\"").
func CloseStream(s Stream, abort bool, release func(), what string) error {
	err := QuietStderr(func() error {
		end := s.Stop
		if abort {
			end = s.Abort
		}
		err := end()
		if cerr := s.Close(); err == nil {
			err = cerr
		}
		return err
	})
	release()
	if err != nil {
		return fmt.Errorf("%s: close: %w", what, err)
	}
	return nil
}

var (
	portAudio       shared
	streamNumbering sync.Once
)

// The binding hands each stream's serial number to C as a pointer. Go's
// checkptr (on under -race) rejects such values below 4096, so a second
// stream in a race-enabled binary dies. OpenStream with no callback fails
// before reaching C but still takes a number: spend the low numbers once.
func skipLowStreamNumbers() {
	for range 4096 {
		_, _ = portaudio.OpenStream(portaudio.StreamParameters{})
	}
}

// InitPortAudio initialises PortAudio quietly; every caller that opens
// streams or lists devices holds it, and the last release terminates
// PortAudio. Release is safe to call more than once.
func InitPortAudio() (release func(), err error) {
	return portAudio.hold(func() error {
		// Never let libjack start a server of its own: it is slow and noisy.
		if os.Getenv("JACK_NO_START_SERVER") == "" {
			os.Setenv("JACK_NO_START_SERVER", "1")
		}
		if err := QuietStderr(portaudio.Initialize); err != nil {
			return fmt.Errorf("portaudio: %w", err)
		}
		streamNumbering.Do(skipLowStreamNumbers)
		return nil
	}, func() { _ = QuietStderr(portaudio.Terminate) })
}

// DeviceInfo describes one audio device as PortAudio sees it.
type DeviceInfo struct {
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
func Devices() ([]DeviceInfo, error) {
	release, err := InitPortAudio()
	if err != nil {
		return nil, err
	}
	defer release()
	var list []DeviceInfo
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

func deviceInfo(d, defIn, defOut *portaudio.DeviceInfo) DeviceInfo {
	info := DeviceInfo{
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

// ErrNoDevice means no input device matched the request.
var ErrNoDevice = errors.New("no such input device")
