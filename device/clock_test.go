package device

import (
	"math"
	"testing"

	"fifthline/internal/vmic"
)

// A frame's time is a block's time plus the frames between them at the
// stream's rate, before the block or after it.
func TestFrameTimeCountsFramesAtTheRate(t *testing.T) {
	for _, c := range []struct {
		t0   float64
		di   int64
		rate float64
		want float64
	}{
		{100, 0, 48000, 100},
		{100, 48000, 48000, 101},
		{100, 512, 48000, 100 + 512.0/48000},    // the next callback's block
		{100, -2048, 48000, 100 - 2048.0/48000}, // a frame read before the block
		{0.5, 4410, 44100, 0.6},
	} {
		if got := frameTime(c.t0, c.di, c.rate); got != c.want {
			t.Errorf("frameTime(%v, %d, %v) = %v, want %v", c.t0, c.di, c.rate, got, c.want)
		}
	}
}

// On the real stack every frame read reached the converter before the
// stream clock's now, and frames are a frame's length apart on it.
func TestInputTimesFramesOnTheStreamClock(t *testing.T) {
	vmic.Isolate(t)
	in, err := OpenInput(InputOptions{})
	if err != nil {
		t.Fatal(err)
	}
	defer in.Close()
	if _, ok := in.ADCTime(0); ok {
		// Possible only if a block came already; harmless, but say so.
		t.Log("a block arrived before the first read")
	}
	waitForBlocks(t, in)
	buf := make([]float32, 1024)
	var read int64
	for read < int64(in.SampleRate()) {
		n, err := in.Read(buf)
		if err != nil {
			t.Fatal(err)
		}
		read += int64(n)
	}
	now := in.StreamTime()
	first, ok := in.ADCTime(0)
	last, _ := in.ADCTime(read - 1)
	if !ok {
		t.Fatal("no ADC time after a second of reading")
	}
	t.Logf("first frame at %.4f s, frame %d at %.4f s, read at %.4f s: %.1f ms later",
		first, read-1, last, now, 1000*(now-last))
	if !(last < now) {
		t.Errorf("frame %d reached the converter at %.4f s, not before it was read at %.4f s", read-1, last, now)
	}
	if span, want := last-first, float64(read-1)/in.SampleRate(); math.Abs(span-want) > 1e-6 {
		t.Errorf("frames 0 and %d are %.6f s apart, want %.6f", read-1, span, want)
	}
	in.Close()
	if got := in.StreamTime(); got != 0 {
		t.Errorf("StreamTime after Close = %v, want 0", got)
	}
}
