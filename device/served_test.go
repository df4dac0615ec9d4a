package device

import (
	"strings"
	"testing"
)

// pactl's words for a source, as `LC_ALL=C pactl list sources` prints them
// (PulseAudio 16.1, a four-channel null sink's monitor; measured).
const pactlSources = `Source #3
	State: SUSPENDED
	Name: quartet.monitor
	Description: Monitor of four inputs
	Driver: module-null-sink.c
	Sample Specification: s16le 4ch 48000Hz
	Channel Map: front-left,front-right,rear-left,rear-right
`

func TestDescribeReadsPactlsSource(t *testing.T) {
	if d, n := describe(pactlSources, "quartet.monitor"); d != "Monitor of four inputs" || n != 4 {
		t.Errorf("described as %q with %d channels", d, n)
	}
	if d, n := describe(pactlSources, "other"); d != "" || n != 0 {
		t.Errorf("another source described as %q with %d channels", d, n)
	}
}

// The server's words are read, whatever they hold, without a panic.
func FuzzDescribe(f *testing.F) {
	f.Add(pactlSources, "quartet.monitor")
	f.Add(strings.ReplaceAll(pactlSources, "4ch", "ch"), "quartet.monitor")
	f.Add("Name:\nSample Specification: 99999999999999999999ch\n", "")
	f.Fuzz(func(t *testing.T, list, name string) {
		if _, n := describe(list, name); n < 0 {
			t.Errorf("%d channels from %q", n, list)
		}
		field(list, name)
	})
}
