package main

import (
	"os/exec"
	"path/filepath"
	"testing"
)

// listen --voices 3 with the meter, through a private one-channel null
// sink: sox's sawtooth C4 with E4 and G4 just above it (261.63 Hz, equal
// temperament at A4 = 440 Hz, ISO 16; 5/4 and 3/2: common practice) for
// 2 s, then F4 and A4 (349.23 and 440 Hz, equal temperament) for 4 s. While
// F4 and A4 sound, the third voice's row says it is not heard instead of
// the G4 of the chord before (the screen is read while the take plays).
func TestVoicesMeterSaysAVoiceIsNotHeard(t *testing.T) {
	t.Parallel()
	sink, env, _ := privateMic(t)
	first := sox(t, "c.wav", "-r", "48000", "-b", "16", "synth 2 sawtooth 261.63 sawtooth 327.0375 sawtooth 392.445 remix 1,2,3 gain -8 pad 0.5 0")
	then := sox(t, "f.wav", "-r", "48000", "-b", "16", "synth 4 sawtooth 349.23 sawtooth 440 remix 1,2 gain -8 pad 0 1")
	wav := filepath.Join(t.TempDir(), "take.wav")
	soxTB(t, first, then, wav)
	m := startTmux(t, 80, 24, env, "listen", "--voices", "3", "--key", "C major")
	m.waitFor(`no chord yet`, `input +(silent|−[0-9]+ dBFS)`)
	played := make(chan error, 1)
	go func() { played <- exec.Command("paplay", "--device="+sink, wav).Run() }()
	m.waitFor(` 3 voice 3 +G4 `)
	m.waitFor(` 1 voice 1 +F4 `, ` 2 voice 2 +A4 `, ` 3 voice 3 +not heard`)
	if err := <-played; err != nil {
		t.Fatalf("paplay: %v", err)
	}
	m.quitCleanly()
}
