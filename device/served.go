package device

import (
	"context"
	"fmt"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"time"
)

// Served is the sound server's source behind a device that a sound server
// (PulseAudio, or PipeWire speaking its protocol) serves: what is really
// listened to when PortAudio names only ALSA's "default". The server remixes
// a stream to any channel count, so Channels is the count that carries
// sound, not PortAudio's 32.
type Served struct {
	Server      string // "PulseAudio" or "PipeWire"
	Name        string // the server's name for it: "alsa_input.usb-…", "mic.monitor"
	Description string // the server's words for it, as its volume control shows them
	Channels    int    // 0 where the server did not say
	ByEnv       bool   // PULSE_SOURCE named it, not the server's default
}

// servedNames are the ALSA devices that a sound server's plugin stands
// behind (the default is routed to it wherever a server runs).
var servedNames = map[string]bool{"default": true, "pulse": true, "pipewire": true}

// pactlWait is how long pactl may take before the name is given up on.
const pactlWait = 2 * time.Second

// Serves reports whether a sound server may stand behind the device (one
// of ALSA's names for its plugin), without asking the server.
func Serves(dev Info) bool { return dev.HostAPI == "ALSA" && servedNames[dev.Name] }

// ServedSource is the sound server's source behind an input device; ok is
// false where no server serves it or none answers.
func ServedSource(dev Info) (Served, bool) { return servedSource(dev) }

// servedSource asks the sound server, through pactl, which source the
// device reaches: PULSE_SOURCE where the environment sets it, else the
// server's default source. ok is false where the device is no server's,
// or pactl is missing or gets no answer: the device's own name then says
// all that is known.
func servedSource(dev Info) (s Served, ok bool) {
	if !Serves(dev) {
		return s, false
	}
	info, err := pactl("info")
	if err != nil {
		return s, false
	}
	s.Server = "PulseAudio"
	if strings.Contains(field(info, "Server Name"), "PipeWire") {
		s.Server = "PipeWire"
	}
	if s.Name = os.Getenv("PULSE_SOURCE"); s.Name != "" {
		s.ByEnv = true
	} else {
		s.Name = field(info, "Default Source")
	}
	if s.Name == "" {
		return s, false
	}
	if list, err := pactl("list", "sources"); err == nil {
		s.Description, s.Channels = describe(list, s.Name)
	}
	return s, true
}

// pactl runs pactl with its words untranslated (they are parsed).
func pactl(args ...string) (string, error) {
	ctx, cancel := context.WithTimeout(context.Background(), pactlWait)
	defer cancel()
	cmd := exec.CommandContext(ctx, "pactl", args...)
	cmd.Env = append(os.Environ(), "LC_ALL=C")
	out, err := cmd.Output()
	return string(out), err
}

// field is the value of "key: value" in pactl's output, trimmed.
func field(out, key string) string {
	for line := range strings.Lines(out) {
		if k, v, ok := strings.Cut(strings.TrimSpace(line), ":"); ok && k == key {
			return strings.TrimSpace(v)
		}
	}
	return ""
}

// describe finds the source name in `pactl list sources` and gives its
// description and channel count ("Sample Specification: s16le 4ch 48000Hz").
func describe(list, name string) (description string, channels int) {
	mine := false
	for line := range strings.Lines(list) {
		k, v, ok := strings.Cut(strings.TrimSpace(line), ":")
		if !ok {
			continue
		}
		v = strings.TrimSpace(v)
		switch k {
		case "Name":
			mine = v == name
		case "Description":
			if mine {
				description = v
			}
		case "Sample Specification":
			if mine {
				for _, w := range strings.Fields(v) {
					if n, err := strconv.Atoi(strings.TrimSuffix(w, "ch")); err == nil && n > 0 && strings.HasSuffix(w, "ch") {
						channels = n
					}
				}
			}
		}
	}
	return description, channels
}

// Words are the source for a musician: its description, else its name.
func (s Served) Words() string {
	if s.Description != "" {
		return s.Description
	}
	return s.Name
}

// Heard names what a device reaches for a musician: its PortAudio name, and
// where a sound server serves it the source behind it ("default
// (PulseAudio: Scarlett 2i2 USB Analog Stereo)").
func (s Served) heard(device string) string {
	if s.Name == "" {
		return device
	}
	return fmt.Sprintf("%s (%s: %s)", device, s.Server, s.Words())
}
