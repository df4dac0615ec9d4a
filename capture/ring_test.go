package capture

import (
	"sync"
	"testing"
)

// The ring delivers every block whole and in order, or refuses it whole;
// a plain slice is the model it must agree with.
func TestRingKeepsOrderAndRefusesWholeBlocks(t *testing.T) {
	q := newRing(10)
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
		n := q.read(out)
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
	q := newRing(4096)
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
		n := q.read(out)
		for _, v := range out[:n] {
			if v != float32(want) {
				t.Fatalf("read %v, want %v", v, want)
			}
			want++
		}
	}
	wg.Wait()
}
