package device

import (
	"runtime"
	"testing"

	"golang.org/x/sys/unix"
)

// sync/atomic needs every field Go reads or writes atomically in C's ring
// naturally aligned (the sync/atomic documentation: 64-bit words must be
// 8-byte aligned on 32-bit platforms; C aligns int64 to 4 in a struct on
// 32-bit x86, which is why ring.h asks for 8).
func TestRingAtomicFieldsAreAligned(t *testing.T) {
	fields := atomicFields()
	if len(fields) < 13 {
		t.Fatalf("only %d fields listed", len(fields))
	}
	for _, f := range fields {
		if f.size != 4 && f.size != 8 {
			t.Errorf("%s is %d bytes: not a word sync/atomic reads", f.name, f.size)
		}
		if f.offset%f.size != 0 {
			t.Errorf("%s at offset %d is not %d-byte aligned", f.name, f.offset, f.size)
		}
	}
}

// An input ring carries the channels asked for, in the order asked for,
// from interleaved frames, and ReadChannels hands each to its own slice,
// across the ring's wrap.
func TestRingCarriesChosenChannelsInOrder(t *testing.T) {
	const channels, frames = 4, 300
	q, err := newRing(700, channels, []int{3, 0, 2}, -1) // 700 frames: the third delivery wraps
	if err != nil {
		t.Fatal(err)
	}
	buf := make([]float32, channels*frames)
	dst := [][]float32{make([]float32, 256), make([]float32, 256), make([]float32, 256)}
	next := 0 // frame number of the next sample read
	for round := range 6 {
		for i := range frames {
			for c := range channels {
				buf[i*channels+c] = float32((round*frames+i)*10 + c) // frame·10 + channel
			}
		}
		q.deliver(buf, frames)
		for {
			n := q.readChannels(dst)
			if n == 0 {
				break
			}
			for k, c := range []int{3, 0, 2} {
				for i, v := range dst[k][:n] {
					if want := float32((next+i)*10 + c); v != want {
						t.Fatalf("round %d: slice %d sample %d = %v, want %v (frame %d, channel %d)", round, k, i, v, want, next+i, c)
					}
				}
			}
			next += n
		}
	}
	if next != 6*frames {
		t.Errorf("read %d frames, want %d", next, 6*frames)
	}
	if st := q.stats(); st.DroppedBlocks != 0 || st.Blocks != 6 {
		t.Errorf("stats %+v, want 6 blocks and none dropped", st)
	}
	for _, bad := range [][]int{{}, {4}, {-1}} {
		if _, err := newRing(100, channels, bad, -1); err == nil {
			t.Errorf("newRing with channels %v of %d: no error", bad, channels)
		}
	}
}

// A stream that will not close leaves its ring and pipe to the audio
// thread: every one of them is kept, not just the last, and the pipe's
// read end stays open (a write to a pipe without a reader raises SIGPIPE,
// which on a thread Go does not own ends the process).
func TestLeakedRingsAndPipesAreAllKept(t *testing.T) {
	var writeEnds []int
	for range 3 {
		p, err := newWakePipe()
		if err != nil {
			t.Fatal(err)
		}
		q, err := newRing(1024, 1, []int{0}, p.w)
		if err != nil {
			t.Fatal(err)
		}
		keepLeaked(q, p)
		writeEnds = append(writeEnds, p.w)
	}
	for range 3 {
		runtime.GC() // a finalizer or cleanup of anything unkept would run now
	}
	for i, fd := range writeEnds {
		if _, err := unix.Write(fd, []byte{1}); err != nil {
			t.Errorf("leaked pipe %d: the audio thread's write would fail: %v", i, err)
		}
	}
	leaked.Lock()
	defer leaked.Unlock()
	if len(leaked.rings) < 3 || len(leaked.pipes) < 3 {
		t.Errorf("kept %d rings and %d pipes, want all 3", len(leaked.rings), len(leaked.pipes))
	}
}
