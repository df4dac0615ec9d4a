package multipitch

import (
	"cmp"
	"math"
	"slices"
)

// A low voice followed while its own partials sound. Under three or four
// louder voices a quiet low voice's candidate comes late in the whitened
// salience, behind the upper voices' partials (a woodwind quartet's
// bassoon A2 under E4 C5 A5, 6 to 8 dB under them: from 3.8 s no whole
// window's six candidates held it, and where it was one it was the fifth
// voice to explain enough and went as the one found last); and where the
// upper voices lie on its harmonics, what it explains that they do not is
// little beside a bar their own movement raises. Its partials that lie on
// no other candidate's, its fundamental and the odd ones over it, still
// stand 30 to 58 dB over the noise floor (measured on that take's bassoon
// A2 and G2; where it has stopped, its place reads under 13 dB). So the
// lowest of the voices heard in the last followSeconds since the last
// onset, where a frame's prune loses it, is pruned for again and kept
// (keep) while at least ownMin of its first ownParts partials, one odd,
// make sharp peaks of their own ownGain over the floor and the window is
// not releaseDB under the loudest that heard it unfollowed; its release is
// where they stop (the bassoon's G2 under D4 B4 G5, on its 3rd, 5th and
// 8th partials, ended 0.46 s early, lost to the bar).

const (
	// followSeconds: how long a voice last heard is followed.
	followSeconds = 1.0
	// ownParts: the partials looked at, the fundamental up; a low voice's
	// strongest lie among them.
	ownParts = 8
	// ownMin: partials of its own that must sound, one of them odd (an
	// octave's voice has no odd partials of its own).
	ownMin = 3
	// ownGain (power): 20 dB over the floor (the median bin's power).
	ownGain = 100.0
	// ownCents: a partial this near another candidate's (or 3 bins) is
	// shared: a chorused voice's partials lie up to 17 ¢ from harmonic.
	ownCents = 25.0
	// releaseDB: a window half past the chord's release holds half its
	// amplitude, 6 dB down; a window that much under the loudest that
	// heard the voice followed is the release, where its partials ring
	// on (a cello's, reading 30 ¢ sharp): not followed there.
	releaseDB = 6.0
	// harmonicCents: a voice this near a harmonic of the voice followed
	// lies on it (a semitone's half, as a note's spelling).
	harmonicCents = 50.0
	// stepCents: a candidate within a whole tone of the voice followed is
	// likely its part's next note (a choir's bass from F3 to E3 over a
	// breath no onset marks, followed without the sharpness test), which
	// the old note is not held over.
	stepCents = 200.0
	// sharpGain (power): two bins from its peak, a steady partial under
	// the Hann window lies at least 1.5 bins off, where the window's
	// transform, sinc(x)/(1−x²), stands 15.4 dB under its peak (computed);
	// a partial smeared by a vibrato or a chorus (bowed strings, choir
	// aahs), which the whole window loses for its smear, not for its
	// neighbours, stands less than 7 dB over it there: a broad peak
	// (peakAt), which counts toward no ownMin, and with which keep leaves
	// a voice the search found to the bar.
	sharpGain = 0.2
)

// heardVoice is a voice of a frame emitted, when, and the level of the
// loudest frame that heard it without following (a release decays
// gradually, frame by frame).
type heardVoice struct{ hz, at, level float64 }

// heard notes the voices vs of the frame emitted at t, read by by (the
// whole or the half window's estimator) on a window level dBFS loud;
// after an onset only the voices heard since are followed.
func (e *Estimator) heard(t, level float64, vs []Voice, by *Estimator) {
	onset := float64(e.onsetAt) / e.rate
	e.recent = slices.DeleteFunc(e.recent, func(h heardVoice) bool { return h.at < t-followSeconds || h.at < onset })
	for _, v := range vs {
		h := heardVoice{v.Hz, t, level}
		i := slices.IndexFunc(e.recent, func(h heardVoice) bool { return math.Abs(cents(h.hz, v.Hz)) < twinCents })
		if i < 0 {
			e.recent = append(e.recent, h)
			continue
		}
		h.level = max(h.level, e.recent[i].level)
		if by.rescued && by.isKept(v.Hz) {
			h.level = e.recent[i].level
		}
		e.recent[i] = h
	}
}

// following lists the voices heard lately for the next frame's fits, the
// half window's too.
func (e *Estimator) following() {
	e.follow = append(e.follow[:0], e.recent...)
	if e.short != nil {
		e.short.follow = e.follow
	}
}

// toFollow is the lowest voice followed where this frame may keep it (0:
// none): not in its release, no candidate a step from it, and its own
// partials sounding (ownSounding).
func (e *Estimator) toFollow() float64 {
	if len(e.follow) == 0 {
		return 0
	}
	low := slices.MinFunc(e.follow, func(a, b heardVoice) int { return cmp.Compare(a.hz, b.hz) })
	step := func(g float64) bool { d := math.Abs(cents(g, low.hz)); return d >= twinCents && d < stepCents }
	if e.level < low.level-releaseDB || (e.cfg.Accept != nil && !e.cfg.Accept(low.hz)) || slices.ContainsFunc(e.f0, step) || !e.ownSounding(low.hz) {
		return 0
	}
	return low.hz
}

// keep prunes the candidates again with the voice followed at hz, which
// the prune without it lost, kept: past the voices cap, and short of the
// bar where the search did not reach it or, in the whole window, none of
// its own partials makes a broad peak (heldOwn); a chorused voice's
// smeared partials are the bar's to judge (the rendered choir's E3, its
// own 4th partial broad, read up to 0.9 ¢ elsewhere when held so, on
// other frame grids). That reading stands unless it costs a voice the
// prune without it kept, save one on its harmonics (its partial, maybe:
// the bassoon A2's 4th read as A4). Kept without the sharpness test, a
// chorused bass's F3 took the place of the C4 a fifth above it (the
// rendered choir's F major seventh).
func (e *Estimator) keep(hz float64) {
	e.without = append(e.without[:0], e.f0...)
	_, broad, _ := e.ownPartialPeaks(hz) // beside the voices heard without it
	e.steady = broad == 0 && e.short != nil
	e.f0 = append(e.f0[:0], e.cands...)
	e.added = !slices.ContainsFunc(e.f0, near(hz))
	if e.added {
		e.f0 = append(e.f0, hz)
	}
	e.kept, e.rescued = hz, true
	if !e.added && !e.steady && !e.capped {
		// Held to the bar as the prune without it held it, and no voice
		// over the cap to weigh it against: that prune would come out
		// again as it did, without it. It stands.
		e.f0 = append(e.f0[:0], e.without...)
		return
	}
	e.dropped = append(e.dropped[:0], e.drop...)
	e.drop = e.drop[:0]
	e.swapFit()
	e.prune()
	for _, g := range e.without {
		k := math.Round(g / hz)
		if !slices.ContainsFunc(e.f0, near(g)) && (k < 2 || math.Abs(cents(g, k*hz)) >= harmonicCents) {
			// The prune without it stands, as it came out: its voices,
			// what it dropped, and its fit (pruning again gave the same).
			e.f0 = append(e.f0[:0], e.without...)
			e.drop = append(e.drop[:0], e.dropped...)
			e.swapFit()
			e.kept, e.rescued = 0, false
			return
		}
	}
}

// swapFit exchanges the estimator's fit for a second one, so that keep's
// prune leaves the fit of the prune without the voice followed as it was.
func (e *Estimator) swapFit() {
	if e.spare == nil {
		e.spare = e.fitter.sibling()
	}
	e.fitter, e.spare = e.spare, e.fitter
}

// heldOwn: the voice at hz is the one followed, held to its own partials
// instead of the bar (keep).
func (e *Estimator) heldOwn(hz float64) bool { return e.isKept(hz) && (e.added || e.steady) }

// near is a test for a pitch within twinCents of hz: the same voice.
func near(hz float64) func(float64) bool {
	return func(g float64) bool { return math.Abs(cents(g, hz)) < twinCents }
}

// halfHearsMore reports whether the half window's voices alt stand for the
// frame over the whole window's out (whole): where it hears more voices
// than the whole window does without following, and holds the voice the
// whole window kept by following, if any. So keeping a voice in the whole
// window does not overrule the half's hearing more (its own vibrato voice
// steadier there), nor a half window that loses the low voice followed
// take the frame with a partial in its place; nor a half window that hears
// only the voices the whole one holds, the low voice followed among them,
// whose bins, twice the whole window's, part its partials from the upper
// voices' beside them less well (a woodwind quartet's bassoon G2, its
// frames from 1.21 to 1.49 s taken from the half window as the one that
// heard it unfollowed: at 1.30 s, where its sub-windows agree and the
// long reading stands, 8.7 ¢ sharp, the whole window 4.6, alone 3.9).
func (e *Estimator) halfHearsMore(alt, out []Voice) bool {
	n := len(out)
	if e.rescuedIn(out) {
		n--
		if !slices.ContainsFunc(alt, func(v Voice) bool { return e.isKept(v.Hz) }) {
			return false
		}
		if heardIn(alt, out) {
			return false
		}
	}
	if e.short.rescuedIn(alt) {
		return len(alt)-1 > n
	}
	return len(alt) > n
}

// heardIn: every voice of vs lies near one of in.
func heardIn(vs, in []Voice) bool {
	return !slices.ContainsFunc(vs, func(a Voice) bool {
		return !slices.ContainsFunc(in, func(v Voice) bool { return near(v.Hz)(a.Hz) })
	})
}

// rescuedIn: vs holds the voice followed, kept only so.
func (e *Estimator) rescuedIn(vs []Voice) bool {
	return e.rescued && slices.ContainsFunc(vs, func(v Voice) bool { return e.isKept(v.Hz) })
}

// isKept: the voice at hz is the one followed and kept (the fit moves it a
// few cents at most).
func (e *Estimator) isKept(hz float64) bool { return e.kept > 0 && near(e.kept)(hz) }

// ownSounding reports whether at least ownMin of hz's first ownParts
// partials, one odd, that lie on no other candidate's partial make sharp
// peaks of their own ownGain over the noise floor (ownPartialPeaks).
func (e *Estimator) ownSounding(hz float64) bool {
	sharp, _, odd := e.ownPartialPeaks(hz)
	return sharp >= ownMin && odd
}

// ownSteady reports whether hz's own partials sound (ownSounding) and none
// of them is smeared: a steady voice's.
func (e *Estimator) ownSteady(hz float64) bool {
	sharp, broad, odd := e.ownPartialPeaks(hz)
	return sharp >= ownMin && odd && broad == 0
}

// ownPartialPeaks counts hz's first ownParts partials that lie on no other
// candidate's partial and make a peak (a local maximum within a bin of
// them) ownGain over the noise floor: sharp ones (peakAt), and broad ones,
// smeared by a vibrato or a chorus; odd: a sharp one is odd.
func (e *Estimator) ownPartialPeaks(hz float64) (sharp, broad int, odd bool) {
	bin := e.fitter.binHz
	for k := 1; k <= ownParts; k++ {
		p := float64(k) * hz
		b := int(math.Round(p / bin))
		if p >= e.fitter.ceilHz || b+2 >= len(e.spec) {
			break
		}
		if e.sharedPartial(p, hz) {
			continue
		}
		switch e.peakAt(b) {
		case sharpPeak:
			sharp++
			odd = odd || k%2 == 1
		case broadPeak:
			broad++
		}
	}
	return sharp, broad, odd
}

// sharedPartial: a partial of another candidate (not hz's twin) lies
// within 3 bins or ownCents of p.
func (e *Estimator) sharedPartial(p, hz float64) bool {
	within := math.Max(3*e.fitter.binHz, p*(math.Exp2(ownCents/1200)-1))
	return slices.ContainsFunc(e.f0, func(g float64) bool {
		m := math.Round(p / g)
		return math.Abs(cents(g, hz)) >= twinCents && m >= 1 && math.Abs(p-m*g) < within
	})
}

// The peaks ownPartialPeaks tells apart.
const (
	noPeak = iota
	broadPeak
	sharpPeak
)

// peakAt: a local maximum of power within a bin of b stands ownGain over
// the floor (a neighbour's lobe leaking in rises toward it instead), and
// is sharp where it stands 1/sharpGain over the bins two from it.
func (e *Estimator) peakAt(b int) int {
	found := noPeak
	for j := max(b-1, 2); j <= b+1 && j+2 < len(e.spec); j++ {
		p := power(e.spec[j])
		if p <= ownGain*e.floor || p < power(e.spec[j-1]) || p < power(e.spec[j+1]) {
			continue
		}
		if max(power(e.spec[j-2]), power(e.spec[j+2])) < sharpGain*p {
			return sharpPeak
		}
		found = broadPeak
	}
	return found
}
