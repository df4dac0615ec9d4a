package device

import (
	"errors"
	"os"
	"sync"
	"testing"
	"time"

	"golang.org/x/sys/unix"

	"fifthline/source"
)

// The ring delivers every block whole and in order, or refuses it whole;
// a plain slice is the model it must agree with.
func TestRingKeepsOrderAndRefusesWholeBlocks(t *testing.T) {
	q := testRing(t, 10)
	var model []float32
	next := float32(0)
	steps := []struct {
		write, read int
		accepted    bool
	}{
		{write: 6, read: 0, accepted: true},
		{write: 6, read: 0, accepted: false}, // 4 free: refused whole, nothing half-written
		{write: 4, read: 7, accepted: true},
		{write: 7, read: 10, accepted: true}, // wraps around the end
		{write: 0, read: 10, accepted: true},
	}
	for i, s := range steps {
		b := make([]float32, s.write)
		for k := range b {
			b[k], next = next, next+1
		}
		if got := q.write(b); got != s.accepted {
			t.Fatalf("step %d: write(%d) = %v, want %v", i, s.write, got, s.accepted)
		}
		if s.accepted {
			model = append(model, b...)
		}
		out := make([]float32, s.read)
		n := q.readChannels([][]float32{out})
		want := model[:min(s.read, len(model))]
		if n != len(want) {
			t.Fatalf("step %d: read %d samples, want %d", i, n, len(want))
		}
		for k := range want {
			if out[k] != want[k] {
				t.Fatalf("step %d: read %v, want %v", i, out[:n], want)
			}
		}
		model = model[n:]
	}
}

// One writer and one reader at once (run with -race): nothing lost or
// reordered when the reader keeps up.
func TestRingConcurrentWriterAndReader(t *testing.T) {
	q := testRing(t, 4096)
	const total = 200000
	var wg sync.WaitGroup
	wg.Go(func() {
		b := make([]float32, 100)
		for v := 0; v < total; {
			for i := range b {
				b[i] = float32(v + i)
			}
			if q.write(b) {
				v += len(b)
			}
		}
	})
	out := make([]float32, 333)
	for want := 0; want < total; {
		n := q.readChannels([][]float32{out})
		for _, v := range out[:n] {
			if v != float32(want) {
				t.Fatalf("read %v, want %v", v, want)
			}
			want++
		}
	}
	wg.Wait()
}

func testRing(t *testing.T, capacity int) *ring {
	t.Helper()
	q, err := newRing(capacity, 1, []int{0}, -1)
	if err != nil {
		t.Fatal(err)
	}
	return q
}

// The audio thread's work on one callback: the chosen channel of
// interleaved frames goes into the ring in whole 512-frame blocks, and
// peak, clipping, blocks and drops are counted.
func TestRingDeliverKeepsOneChannelAndCounts(t *testing.T) {
	q, err := newRing(1000, 3, []int{1}, -1) // room for one 512-frame block, not two
	if err != nil {
		t.Fatal(err)
	}
	const frames = 1024
	buf := make([]float32, 3*frames)
	for i := range frames {
		buf[3*i], buf[3*i+1], buf[3*i+2] = 0.9, float32(i)/2048, -1 // only the middle one is kept
	}
	buf[3*700+1] = -1 // a full-scale sample in the second block, which will not fit
	q.deliver(buf, frames)
	st := q.stats()
	want := source.InputStats{Blocks: 1, DroppedBlocks: 1, DroppedSamples: 512, Peak: 1, Clipped: 1}
	if st != want {
		t.Errorf("stats %+v, want %+v", st, want)
	}
	out := make([]float32, 2000)
	n := q.readChannels([][]float32{out})
	if n != 512 {
		t.Fatalf("read %d samples, want the first block's 512", n)
	}
	for i, v := range out[:n] {
		if v != float32(i)/2048 {
			t.Fatalf("sample %d = %v, want %v (channel 2 of 3)", i, v, float32(i)/2048)
		}
	}
	if q.lastBlock() == 0 {
		t.Error("the delivery time was not recorded")
	}
}

// A reader that said it is waiting gets one wake-up byte per delivery
// after it said so, and none when it did not.
func TestRingWakesOnlyAWaitingReader(t *testing.T) {
	var fds [2]int
	if err := unix.Pipe2(fds[:], unix.O_NONBLOCK); err != nil {
		t.Fatal(err)
	}
	defer unix.Close(fds[0])
	defer unix.Close(fds[1])
	q, err := newRing(4096, 1, []int{0}, fds[1])
	if err != nil {
		t.Fatal(err)
	}
	pending := func() int {
		b := make([]byte, 16)
		n, _ := unix.Read(fds[0], b)
		return max(n, 0)
	}
	q.write(make([]float32, 10))
	if n := pending(); n != 0 {
		t.Errorf("%d wake-ups with nobody waiting", n)
	}
	q.waiting(true)
	q.write(make([]float32, 10))
	q.write(make([]float32, 10))
	if n := pending(); n != 1 {
		t.Errorf("%d wake-ups for a waiting reader and two writes, want 1", n)
	}
}

// Interrupt ends a Wait in progress and every later one at once, whatever
// deadline they set.
func TestWakePipeInterruptEndsWaitsForGood(t *testing.T) {
	p, err := newWakePipe()
	if err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	done := make(chan error)
	go func() { done <- p.Wait(time.Now().Add(time.Minute)) }()
	time.Sleep(50 * time.Millisecond)
	p.Interrupt()
	select {
	case err := <-done:
		if !errors.Is(err, os.ErrDeadlineExceeded) {
			t.Errorf("interrupted Wait: %v", err)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("Wait went on after Interrupt")
	}
	start := time.Now()
	if err := p.Wait(time.Now().Add(time.Minute)); !errors.Is(err, os.ErrDeadlineExceeded) || time.Since(start) > time.Second {
		t.Errorf("a Wait after Interrupt: %v after %v", err, time.Since(start))
	}
}

// A byte from the C side ends a Wait.
func TestWakePipeWakesOnAByte(t *testing.T) {
	p, err := newWakePipe()
	if err != nil {
		t.Fatal(err)
	}
	defer p.Close()
	if _, err := unix.Write(p.w, []byte{1}); err != nil {
		t.Fatal(err)
	}
	if err := p.Wait(time.Now().Add(5 * time.Second)); err != nil {
		t.Errorf("Wait with a byte waiting: %v", err)
	}
	if err := p.Wait(time.Now().Add(20 * time.Millisecond)); !errors.Is(err, os.ErrDeadlineExceeded) {
		t.Errorf("Wait with nothing waiting: %v, want the deadline", err)
	}
}
