package multipitch

import (
	"math"
	"testing"

	"fifthline/internal/testsignal"
)

// The joint fit is a nonlinear least-squares one (Christensen and
// Jakobsson, Multi-Pitch Estimation, 2009): where it lands must not depend
// on where it starts, and it must have arrived. Additive voices with exact
// truth, 40 dB SNR: a bass F3 and the fifth above it, just (3:2, from the
// ratio) and 2 ¢ wide, the C4's 2nd and 4th partials on or beside the F3's
// 3rd and 6th. The long window's final fit (settle) begun from the truth
// and from 8 ¢ either side of it lands on the truth within 0.05 ¢, and
// Gauss–Newton steps taken on from there until they are under 0.001 ¢
// (at most 50) move it by less than 0.05 ¢: its few steps have converged.
//
// Not held here, measured: with a 5.5 Hz vibrato of ±13 ¢ on both voices
// the settled fit lands up to 1.1 ¢ apart from the three starts, and
// iterated to convergence still 0.22 ¢ apart (two minima, the residuals
// 0.1 % apart); on rendered choir aahs (FluidR3 program 52) its few steps
// keep 2.1 to 3.5 ¢ of an 8 ¢ start offset on average, and converged fits
// read the rendered scenes no better (TestVoicesOfRenderedEnsembles'
// choir median 1.82 → 1.83 ¢, string quartet 0.69 → 1.05 ¢).
func TestFitLandsWhereverItStarts(t *testing.T) {
	f3 := et(-16)
	for _, tc := range []struct {
		name  string
		parts []part
	}{
		{"just fifth F3 C4", []part{steady(testsignal.Saw, f3), steady(testsignal.OddOnly, f3*3/2)}},
		{"fifth 2 ¢ wide", []part{steady(testsignal.WeakFund, f3), steady(testsignal.Saw, f3*3/2*math.Exp2(2.0/1200))}},
	} {
		x := chord(1, 40, 11, tc.parts...)
		e, err := New(rate, 0, 0, Config{})
		if err != nil {
			t.Fatal(err)
		}
		hannSpectrum(e.spec, e.frame, x[:e.window], e.win, e.fft)
		for _, start := range []float64{0, -8, 8} {
			e.f0 = e.f0[:0]
			for _, p := range tc.parts {
				e.f0 = append(e.f0, p.ctr*math.Exp2(start/1200))
			}
			e.settle()
			settled := append([]float64(nil), e.f0...)
			e.fitter.broad = true
			steps := iterate(e.fitter, e.f0)
			t.Logf("%s %+g: settled %+.5f %+.5f, iterated %+.5f %+.5f (%d)", tc.name, start, cents(settled[0], tc.parts[0].ctr), cents(settled[1], tc.parts[1].ctr), cents(e.f0[0], tc.parts[0].ctr), cents(e.f0[1], tc.parts[1].ctr), steps)
			e.fitter.broad = false
			for v, p := range tc.parts {
				if d := cents(settled[v], p.ctr); math.Abs(d) > 0.05 {
					t.Errorf("%s begun %+g ¢: voice %d lands %+.3f ¢ from the truth", tc.name, start, v+1, d)
				}
				if d := cents(e.f0[v], settled[v]); math.Abs(d) > 0.05 {
					t.Errorf("%s begun %+g ¢: voice %d moves %+.3f ¢ more in %d steps", tc.name, start, v+1, d, steps)
				}
			}
		}
	}
}

// iterate takes Gauss–Newton steps on f0 with all partials, each clamped
// as refine's last ones are, until none moves a voice by 0.001 ¢ or 50 are
// taken; it returns how many it took.
func iterate(f *fitter, f0 []float64) int {
	before := make([]float64, len(f0))
	for n := 1; n <= 50; n++ {
		copy(before, f0)
		f.build(f0, f.maxK, -1)
		f.solve()
		f.step(f0, 0.5*f.binHz/6)
		moved := 0.0
		for v := range f0 {
			moved = math.Max(moved, math.Abs(cents(f0[v], before[v])))
		}
		if moved < 0.001 {
			return n
		}
	}
	return 50
}
