package device

import "testing"

// BenchmarkInputCallback is the work done on PortAudio's thread per block
// (in C): 512 stereo frames, the second channel taken, levels counted, ring
// written. At 48 kHz a block arrives every 10.7 ms; the callback must take
// a tiny fraction of that.
func BenchmarkInputCallback(b *testing.B) {
	q, err := newRing(1<<20, 2, []int{1}, -1)
	if err != nil {
		b.Fatal(err)
	}
	buf := make([]float32, 2*Block)
	for i := range buf {
		buf[i] = float32(i%200)/100 - 1
	}
	drain := [][]float32{make([]float32, Block)}
	b.SetBytes(int64(len(buf) * 4))
	for b.Loop() {
		q.deliver(buf, Block)
		q.readChannels(drain)
	}
}
