package device

import (
	"testing"
	"time"
)

// The audio thread's work on one callback: the next samples in order,
// silence (counted once started) when the renderer fell short, and a
// wake-up for a waiting renderer only once fewer than the low mark wait.
func TestOutRingPlaysInOrderPadsWithSilenceAndWakesBelowLow(t *testing.T) {
	wake, err := newWakePipe()
	if err != nil {
		t.Fatal(err)
	}
	defer wake.Close()
	woken := func() bool { return wake.Wait(time.Now().Add(20*time.Millisecond)) == nil }
	r, err := newOutputRing(8, 2, 2, wake.w) // 4 stereo frames; wake below 1
	if err != nil {
		t.Fatal(err)
	}
	q := &Output{stream: &stream{ring: r, wake: wake}}
	q.Write([]float32{1, 2, 3, 4, 5, 6, 7, 8})
	r.start()
	r.waiting(true)
	out := make([]float32, 4)
	r.take(out, 2)
	if out[0] != 1 || out[3] != 4 || q.Fill() != 4 || woken() {
		t.Fatalf("first callback played %v, %d left, or woke the renderer too early", out, q.Fill())
	}
	r.take(out, 1) // one frame left: not below the low mark yet
	if woken() {
		t.Error("woke the renderer with the low mark still waiting")
	}
	r.take(out, 2) // the last frame, then short by one
	if out[0] != 7 || out[1] != 8 || out[2] != 0 || out[3] != 0 {
		t.Errorf("short callback played %v, want the last frame then silence", out)
	}
	if !woken() {
		t.Error("no wake-up below the low mark")
	}
	if u := q.Underruns(); u != 1 {
		t.Errorf("%d underruns, want 1", u)
	}
}
