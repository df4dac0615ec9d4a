package multipitch

import (
	"cmp"
	"math"
	"slices"
)

// prune fits the candidates jointly, then drops, one at a time, the voice
// that explains least that the others cannot, while it explains too little
// to be a voice: an octave or unison above a voice (its partials are that
// voice's), a subharmonic guess, a candidate on noise. Twins the fit has
// drawn together become one. Fundamentals are fitted on the plain model,
// and so is the bar (noise); whether a voice explains enough that the others
// cannot is judged with every partial free to widen (fitter.broadened), so
// that a voice whose pitch moves within the window keeps what it smears of
// its own partials instead of leaving it to a "voice" above (and a voice
// an octave above another is judged with the lower one's even partials
// free to move as well: fitter.shifted). The voices kept are then fitted
// afresh from their lowest partials up, with their partials free to widen
// (the widening is even about each partial, so it leaves the partial's
// place to the fundamental, and a vibrato's smear no longer pulls it:
// rendered bassoon and flute parts 1–2 ¢ nearer their truths): after a
// drop, the warm steps leave the dropped voice's pull in the shared
// partials.
func (e *Estimator) prune() {
	f := e.fitter
	e.dropShort(coldSteps, nil, 1)
	e.mergeUnisons()
	e.trial = append(e.trial[:0], e.f0...) // as judged
	e.settle()
	// A voice an octave above another is judged again on the settled fit
	// where that fit moved the voice beneath it: the first, from the
	// candidates' rough fundamentals, can leave the lower voice a few cents
	// off its own even partials (four-partial tones on E3 B3 E4 G♯4: E3 at
	// +5.5 ¢), which the octave then explains, and stays. Only the octave
	// may go, and only where it explains next to nothing (idleShare);
	// where it does not go, the settled fit stands as it was.
	if e.movedUnderOctave(e.trial) {
		e.trial = append(e.trial[:0], e.f0...) // as settled
		e.dropShort(warmSteps, e.octaveOfAnother, idleShare)
		if len(e.f0) < len(e.trial) {
			e.settle()
		} else {
			copy(e.f0, e.trial)
			f.broad = true
			f.build(e.f0, f.maxK, -1)
			f.solve()
			f.broad = false
		}
	}
	for v := range e.f0 {
		for range 2 {
			if !e.lower(v) {
				break
			}
		}
	}
	e.dropHollow()
	e.raiseSubOctaves()
}

// settle fits the voices kept afresh from their lowest partials up, with
// their partials free to widen.
func (e *Estimator) settle() {
	if len(e.f0) > 0 {
		e.fitter.broad = true
		e.fitter.refine(e.f0, -1, coldSteps)
		e.fitter.broad = false
	}
}

// dropShort fits the voices (the first fit's Gauss–Newton steps as steps
// says, warmSteps after) and drops, one at a time, the voice that explains
// less than share of what a voice must (needed) that the others cannot,
// until none does; with only set, only a voice at a pitch it accepts may
// go.
func (e *Estimator) dropShort(steps []int, only func(hz float64) bool, share float64) {
	f := e.fitter
	for ; len(e.f0) > 0; steps = warmSteps {
		noise, total := e.noise(f.refine(e.f0, -1, steps))
		if i, j, ok := e.twins(); ok {
			e.remove(e.weaker(i, j))
			continue
		}
		f.broad = true
		f.build(e.f0, f.maxK, -1)
		resid := f.solve()
		// Of the voices that fall short, the lowest goes first: a
		// subharmonic guess that covers two real voices (C2 under C3 and
		// G3) explains as little that they do not as they do that it does
		// not, and it is the simpler reading to lose (Occam: it spends
		// the most partials). A real voice under its octave double does
		// not fall short: the double cannot explain its odd partials.
		worst := -1
		cols := f.partials()
		for v := range e.f0 {
			if only != nil && !only(e.f0[v]) {
				continue
			}
			base := resid
			if e.octaveOfAnother(e.f0[v]) {
				// The voice beneath it may move where it lies: in both
				// fits, so that they compare.
				f.judged = v
				f.build(e.f0, f.maxK, -1)
				base = f.solve()
			}
			f.build(e.f0, f.maxK, v)
			// (A low voice followed may be held to its own partials
			// instead: follow.go.)
			short := f.solve()-base < share*e.needed(cols-f.partials(), noise, total) && !e.heldOwn(e.f0[v])
			f.judged = -1
			if short && (worst < 0 || e.f0[v] < e.f0[worst]) {
				worst = v
			}
		}
		f.broad = false
		if worst < 0 && len(e.f0) > e.cfg.MaxVoices {
			// More voices explain something than were asked for: the
			// candidate found last goes, the least salient in the
			// whitened spectrum. (Not the least energy in the fit: that
			// drops a quiet real voice before a vibrato voice's octave,
			// which takes its energy from the voice's smeared partials —
			// the rendered choir lost a part and gained a phantom.)
			worst = len(e.f0) - 1
			e.capped = true
			if worst > 0 && e.isKept(e.f0[worst]) {
				worst-- // not the low voice followed (follow.go)
			}
		}
		if worst < 0 {
			break
		}
		e.remove(worst)
	}
}

// octaveOfAnother reports whether the voice at hz lies an octave above
// another.
func (e *Estimator) octaveOfAnother(hz float64) bool {
	return slices.ContainsFunc(e.f0, func(lo float64) bool { return OctaveAbove(hz, lo) })
}

// idleShare is the share of what a voice must explain under which an
// octave judged again goes: a tenth. An octave that is only the lower
// voice's even partials explains next to nothing once that voice sits on
// them; a chorused choir's real octaves, judged again, fall short of the
// whole bar by less (FluidR3's choir aahs lost a part to it).
const idleShare = 0.1

// roughCents is how far settling must move a voice with another an octave
// above it for that octave to be judged again: 2 ¢ (the E3 above moved
// 5.5 ¢).
const roughCents = 2.0

// movedUnderOctave reports whether a voice with another an octave above it
// lies over roughCents from where it was judged (judged, voice by voice).
func (e *Estimator) movedUnderOctave(judged []float64) bool {
	for v, hz := range e.f0 {
		if math.Abs(cents(hz, judged[v])) > roughCents && slices.ContainsFunc(e.f0, func(hi float64) bool { return OctaveAbove(hi, hz) }) {
			return true
		}
	}
	return false
}

// noise is the residual energy per real degree of freedom after the fit
// that left resid, and total the energy of the bins fitted. A voice with
// vibrato leaves a residual no harmonic model removes; a candidate fitting
// that must not pass for a voice, so the bar rises with it.
//
// It rises with every voice dropped too, whose partials then count as
// noise: the rendered choir's prune empties whole windows of its chord
// (voices_mix_test.go). Holding the bar down (at the fullest fit's noise,
// from bins away from every partial, half a bar for a voice heard lately)
// eased the choir but let octave and 3rd-partial phantoms through in the
// meantone, 31-EDO and woodwind quartet scenes (measured; not kept).
func (e *Estimator) noise(resid float64) (noise, total float64) {
	f := e.fitter
	for _, b := range f.used {
		total += real(f.spec[b])*real(f.spec[b]) + imag(f.spec[b])*imag(f.spec[b])
	}
	return resid / math.Max(float64(2*(len(f.used)-len(f.cols))), 1), total
}

// needed is how much residual energy cols more columns must remove to be a
// voice's: κ times what they would fit of the noise by chance, and no less
// than relFloor of the chord.
func (e *Estimator) needed(cols int, noise, total float64) float64 {
	return math.Max(kappa*float64(2*cols)*noise, relFloor*total)
}

// lower tries voice v an octave down, and keeps it there when the partials
// that adds explain enough that no voice did: a fundamental weaker than its
// 2nd partial (bassoon, low brass, a voice's low register) is otherwise
// heard an octave high, since the other voices often cover its odd partials
// too. Where the lower octave's own fundamental, on no voice's partial,
// stands fundamentalGain over the noise floor in what the voices leave,
// the partials added need only explain more than they would of noise by
// chance (the bar less κ): a FluidR3 bassoon's D3 under a cello's A3 and a
// horn's F4 in 31-EDO, its 3rd, 6th, 9th … partials on A3's, was read as
// D4 beside A3 through most of the chord, its fundamental standing 25 to
// 35 dB over the floor unexplained while its 17 odd partials, most of them
// faint or A3's, explained 0.1 to 0.6 of the bar (a pitch that wanders
// fills the noise the bar is reckoned from); a wrong lowering's fundamental
// (that A3's to A2) stood 8 to 15 dB over it (measured).
func (e *Estimator) lower(v int) bool {
	f := e.fitter
	down := e.f0[v] / 2
	if down < e.cfg.MinHz || (e.cfg.Accept != nil && !e.cfg.Accept(down)) || !e.oddEvidence(down) {
		return false
	}
	heard := down < slices.Min(e.f0) && e.overtoneOf(3*down) && !e.shared(down) && e.unexplained(down) > fundamentalGain
	defer func() { // leave the fit of the voices kept in place
		f.build(e.f0, f.maxK, -1)
		f.solve()
	}()
	// Both fits cover the same bins: the voices', and the lower octave's.
	e.trial = append(append(e.trial[:0], e.f0...), down)
	resid := f.refine(e.trial, len(e.f0), warmSteps)
	noise, total := e.noise(resid)
	cols := f.partials()
	e.trial = append(e.trial[:0], e.f0...)
	e.trial[v] = down
	after := f.fit(e.trial, -1)
	twin := math.Abs(cents(e.trial[v], down)) > twinCents
	for u, hz := range e.trial {
		// Lowered beside another voice, it is that voice (unison.go).
		twin = twin || (u != v && math.Abs(cents(hz, e.trial[v])) < unisonCents)
	}
	bar := e.needed(f.partials()-cols, noise, total)
	if heard {
		bar /= kappa
	}
	if twin || resid-after < bar {
		return false
	}
	copy(e.f0, e.trial)
	return true
}

// fundamentalGain (power): 25 dB over the noise floor, where a lower
// octave's own fundamental is heard (lower).
const fundamentalGain = 316.0

// twins finds two voices the fit has put within twinCents of each other.
func (e *Estimator) twins() (int, int, bool) { return e.within(twinCents) }

// weaker is whichever of voices i and j has less fitted energy.
func (e *Estimator) weaker(i, j int) int {
	if e.energyOf(i) < e.energyOf(j) {
		return i
	}
	return j
}

// energyOf is the fitted energy of voice v's partials (sum of squared
// amplitudes), from the last solve.
func (e *Estimator) energyOf(v int) float64 {
	s := 0.0
	for i, a := range e.fitter.amp {
		if c := &e.fitter.cols[i]; c.voice == v && !c.broad {
			s += real(a)*real(a) + imag(a)*imag(a)
		}
	}
	return s
}

func (e *Estimator) remove(v int) {
	e.drop = append(e.drop, e.f0[v])
	e.f0 = slices.Delete(e.f0, v, v+1)
}

// voices appends the kept voices, lowest first.
func (e *Estimator) voices(dst []Voice) []Voice {
	start := len(dst)
	for v, hz := range e.f0 {
		// A partial of amplitude A puts A/2 at the kernel's peak, n/2:
		// |c| = A/2, and the voice's RMS is √(Σ A²/2).
		amp := math.Sqrt(2 * e.energyOf(v))
		dst = append(dst, Voice{Hz: hz, Amplitude: amp, Doubled: 2*hz <= e.cfg.MaxHz && e.doubled(v)})
	}
	slices.SortFunc(dst[start:], func(a, b Voice) int { return cmp.Compare(a.Hz, b.Hz) })
	return dst
}

// oddEvidence is a quick look before lower's two fits: does anything the
// fit of the voices leaves stand 15 dB above the noise floor at the 1st,
// 3rd, 5th or 7th partial of f where no voice has a partial? When every one
// of them is shared, only the fits can tell.
func (e *Estimator) oddEvidence(f float64) bool {
	tested := false
	for k := 1.0; k <= 7; k += 2 {
		hz := k * f
		if e.shared(hz) || int(math.Round(hz/e.fitter.binHz))+1 >= len(e.spec) {
			continue
		}
		tested = true
		if e.unexplained(hz) > 30 {
			return true
		}
	}
	return !tested
}

// shared reports whether hz lies within 3 bins of a voice's partial.
func (e *Estimator) shared(hz float64) bool { return e.onPartialFrom(hz, 1) }

// overtoneOf reports whether hz lies within 3 bins of a voice's partial 2
// or higher.
func (e *Estimator) overtoneOf(hz float64) bool { return e.onPartialFrom(hz, 2) }

// onPartialFrom reports whether hz lies within 3 bins of a voice's k-th
// partial for some k ≥ lowest.
func (e *Estimator) onPartialFrom(hz, lowest float64) bool {
	bin := e.fitter.binHz
	return slices.ContainsFunc(e.f0, func(g float64) bool {
		return math.Abs(hz-g*math.Round(hz/g)) < 3*bin && math.Round(hz/g) >= lowest
	})
}

// unexplained is the most power the fit of the voices leaves in the bins
// at hz and beside it, over the noise floor.
func (e *Estimator) unexplained(hz float64) float64 {
	b, most := int(math.Round(hz/e.fitter.binHz)), 0.0
	for j := max(b-1, 0); j <= b+1 && j < len(e.spec); j++ {
		r := e.spec[j]
		if e.fitter.mark[j] == e.fitter.gen {
			r -= e.fitter.model[j]
		}
		most = math.Max(most, real(r)*real(r)+imag(r)*imag(r))
	}
	return most / e.floor
}
