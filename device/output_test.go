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
	q := &Output{stream: &stream{ring: r, wake: wake}, block: 8}
	q.lead.Store(1)
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

// A writer too slow for the callback (a busy machine) is given a longer
// lead after each underrun, up to maxGrowth times the first, and is woken
// that much earlier.
func TestOutputLeadGrowsAfterUnderruns(t *testing.T) {
	wake, err := newWakePipe()
	if err != nil {
		t.Fatal(err)
	}
	defer wake.Close()
	const block, ahead, low = 4, 2, 1 // samples per block; blocks
	r, err := newOutputRing(maxGrowth*ahead*block, low*block, 1, wake.w)
	if err != nil {
		t.Fatal(err)
	}
	// A rate of one Block a second makes a block of lead one second.
	o := &Output{stream: &stream{ring: r, wake: wake, rate: Block}, block: block, ahead: ahead - low, maxLead: maxGrowth * ahead}
	o.lead.Store(ahead)
	r.start()
	out := make([]float32, maxGrowth*ahead*block+1)
	for i, want := range []int{2, 4, 6, 8, 8} { // leads in blocks, from the start and after each underrun
		if got := o.Cap(); got != want*block {
			t.Errorf("after %d underruns the lead is %d samples, want %d", i, got, want*block)
		}
		o.Write(make([]float32, o.Cap()-o.Fill()))
		r.take(out, o.Cap()+1) // one sample short: an underrun
		o.AwaitRoom(1)
	}
	if g := o.LeadGrowth(); g != 6*time.Second {
		t.Errorf("LeadGrowth = %v, want 6 blocks' time", g)
	}
}
