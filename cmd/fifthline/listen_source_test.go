package main

import (
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"fifthline/internal/vmic"
)

// What the live input really is, as the musician's sound server has it:
// listening through ALSA's "default", the group meter names the PulseAudio
// source behind it (the null sink's monitor, its description as
// `pactl list sources` gives it: "Monitor of" the sink's
// device.description), not "default" alone. While the chord's notes are
// held, and until the chord finder has closed the chord after the input
// goes silent, the journal line says that notes are still to come rather
// than a bare "0 notes"; then it counts them. (The chord is sox's just C
// major of TestListenVoicesGroupMeterInTmux.)
func TestGroupMeterNamesItsSourceAndTheNotesStillToCome(t *testing.T) {
	t.Parallel()
	sink, env, _ := privateMicWith(t, "sink_properties=device.description=fifthline-test-room")
	wav := sox(t, "chord.wav", "-r", "48000", "-b", "16", "synth 3 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8 pad 0.5 1")
	journal := filepath.Join(t.TempDir(), "rehearsal.csv")
	m := startTmux(t, 80, 24, env, "listen", "--voices", "3", "--key", "C major", "--log", journal)
	m.waitFor(`input +(silent|−[0-9]+ dBFS) .* · default \(PulseAudio: Monitor of fifthline-test-room\)`, `journal: 0 notes → rehearsal\.csv\s*\n`)
	// Played without waiting: the screen is read while the chord sounds.
	paplay := exec.Command("paplay", "--device="+sink, wav)
	if err := paplay.Start(); err != nil {
		t.Fatal(err)
	}
	defer paplay.Wait()
	m.waitFor(`chord C major`, `journal: 0 notes → rehearsal\.csv · [1-9] more to come`)
	m.waitFor(`journal: 3 notes → rehearsal\.csv\s*\n`)
	m.quitCleanly()
}

// More players than the source has channels: PulseAudio would make the
// fifth out of the four without a word, so listen refuses, saying how
// many channels the source has, as analyze does for a file (a usage error,
// exit 2); likewise two players on a one-channel microphone, a channel
// past the last, and a stream of more channels than the source has. And
// devices names that source beside PortAudio's devices.
func TestListenRefusesChannelsTheSourceHasNot(t *testing.T) {
	t.Parallel()
	four := vmic.PrivateChannels(t, fourChannels...)
	_, mono, _ := privateMicWith(t, "channels=1")
	for _, c := range []struct {
		env  []string
		args []string
		says string
	}{
		{four.Env(), []string{"--players", "a,b,c,d,e"}, "has 4 channels; e would be on channel 5: name at most 4 players"},
		{four.Env(), []string{"--players", "6=vla,1=vc"}, "has 4 channels; vla would be on channel 6"},
		{four.Env(), []string{"--channel", "5"}, "has 4 channels; channel 5 requested: --channel counts from 1 to 4"},
		{four.Env(), []string{"--players", "a,b", "--input-channels", "6"}, "has 4 channels; a stream of 6 requested: give --input-channels 4 or fewer"},
		{mono, []string{"--players", "a,b"}, "has one channel; --players needs one channel per player"},
	} {
		code, out, stderr := runBinary(t, "", c.env, append([]string{"listen", "--plain", "--duration", "1s"}, c.args...)...)
		checkError(t, code, 2, stderr)
		if !strings.Contains(stderr, c.says) || !strings.Contains(stderr, "default (PulseAudio: Monitor of ") {
			t.Errorf("listen %v: stderr %q, want it to name the source and say %q", c.args, stderr, c.says)
		}
		if out != "" {
			t.Errorf("listen %v: stdout %q", c.args, out)
		}
	}
	// As many as it has: heard, no complaint.
	if code, _, stderr := runBinary(t, "", four.Env(), "listen", "--plain", "--duration", "1s", "--players", "a,b,c,d"); code != 0 {
		t.Errorf("four players on four channels: exit %d, %q", code, stderr)
	}
	// devices says what its 32 channels of "default" reach.
	code, out, stderr := runBinary(t, "", four.Env(), "devices")
	says := regexp.MustCompile(`default: input from PulseAudio's source "Monitor of [^"]+", 4 channels, as PULSE_SOURCE names it\n$`)
	if code != 0 || !says.MatchString(out) {
		t.Errorf("devices: exit %d, stderr %q:\n%s", code, stderr, out)
	}
}
