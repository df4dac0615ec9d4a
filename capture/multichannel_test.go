package capture

import (
	"math"
	"testing"
	"time"

	"fifthline/internal/vmic"
)

// fourChannels is a four-channel interface as PulseAudio names its
// channels (pactl's channel_map syntax).
var fourChannels = []string{"front-left", "front-right", "rear-left", "rear-right"}

// One stream carries every channel asked for, each read into its own
// slice: four players, four different tones made by sox on the four
// channels of one file, played into a four-channel null sink and read back
// from its monitor, each on its own channel.
func TestInputReadsFourChannelsInOneStream(t *testing.T) {
	mic := vmic.IsolateChannels(t, fourChannels...)
	// sox synth: one sine per channel, in order; vol 0.25 is −12 dBFS. The
	// frequencies are A3, E4, A4 and C♯5 in just intonation over A3 = 220 Hz
	// (ISO 16's A4 = 440 Hz; ratios 1, 3/2, 2, 5/2 by definition).
	hz := []float64{220, 330, 440, 550}
	tone := soxFile(t, t.TempDir(), "four.wav", []string{"-r", "48000", "-b", "16", "-c", "4"},
		"3", "sine", "220", "sine", "330", "sine", "440", "sine", "550", "vol", "0.25")
	cases := []struct {
		name     string
		channels []int // asked for, counted from 1
	}{
		{"all four in order", []int{1, 2, 3, 4}},
		{"two, in an order of our own", []int{4, 2}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in, err := OpenInput(InputOptions{Channels: c.channels})
			if err != nil {
				t.Fatal(err)
			}
			defer in.Close()
			if in.Channels() != len(c.channels) {
				t.Fatalf("Channels() = %d, want %d", in.Channels(), len(c.channels))
			}
			// Several channels are read together, never one by one.
			if _, err := in.Read(make([]float32, 64)); err == nil {
				t.Error("Read of a multichannel input: no error")
			}
			if _, err := in.ReadChannels(make([][]float32, len(c.channels)+1)); err == nil {
				t.Error("ReadChannels with one slice too many: no error")
			}
			mic.PlayChannels(tone)
			heard := readHeardChannels(t, in, int(in.SampleRate()))
			for k, ch := range c.channels {
				got := risingCrossingHz(heard[k], in.SampleRate())
				t.Logf("channel %d: heard %.3f Hz", ch, got)
				if math.Abs(got-hz[ch-1]) > 0.05 { // the null sink runs on an exact 48 kHz clock
					t.Errorf("channel %d: heard %.3f Hz, want sox's %v Hz", ch, got, hz[ch-1])
				}
			}
			if st := in.Stats(); st.DroppedBlocks != 0 || st.Clipped != 0 {
				t.Errorf("stats %+v: want nothing dropped or clipped", st)
			}
		})
	}
	// One channel, read as a plain Source (--channel 3), from a stream of
	// all four: PulseAudio would remix a three-channel one.
	in, err := OpenInput(InputOptions{Channel: 3, StreamChannels: 4})
	if err != nil {
		t.Fatal(err)
	}
	defer in.Close()
	mic.PlayChannels(tone)
	if got := risingCrossingHz(readHeard(t, in, int(in.SampleRate())), in.SampleRate()); math.Abs(got-440) > 0.05 {
		t.Errorf("--channel 3: heard %.3f Hz, want sox's 440 Hz", got)
	}
}

// readHeardChannels reads in's channels until the tone has arrived on the
// first (a sample above -26 dBFS), then returns the next want frames of
// each.
func readHeardChannels(t *testing.T, in *Input, want int) [][]float32 {
	t.Helper()
	bufs := make([][]float32, in.Channels())
	heard := make([][]float32, in.Channels())
	for k := range bufs {
		bufs[k] = make([]float32, 1024)
	}
	for deadline := time.Now().Add(5 * time.Second); len(heard[0]) < want; {
		if time.Now().After(deadline) {
			t.Fatalf("heard %d of %d frames within 5 s; stats %+v", len(heard[0]), want, in.Stats())
		}
		n, err := in.ReadChannels(bufs)
		if err != nil {
			t.Fatalf("ReadChannels: %v", err)
		}
		for i := range n {
			if len(heard[0]) > 0 || math.Abs(float64(bufs[0][i])) > 0.05 {
				for k := range heard {
					heard[k] = append(heard[k], bufs[k][i])
				}
			}
		}
	}
	for k := range heard {
		heard[k] = heard[k][:want]
	}
	return heard
}
