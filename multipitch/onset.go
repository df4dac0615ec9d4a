package multipitch

// Onsets: a window long enough to part a just third's coinciding partials
// (a third of a second) would hold a chord's first reading back by as
// much. While the window still reaches back before the chord began, the
// newest half window is read instead: it separates the voices less finely
// but holds only the chord. Short windows to find onsets, long ones to
// measure (the usual split of onset detection from pitch measurement, e.g.
// Klapuri 2003's frames of 93 ms against the 190 ms ones he measures
// pitch on, from memory).

// onsetGain is how far, in power, the newest hop must stand above the rest
// of the window to begin a chord: 10 dB, as a chord entering after a
// breath or a rest does; a chord changing at one level is read on whole
// windows.
const onsetGain = 10.0

// due is the fill at which the next frame is read: a whole window, or at
// the stream's start every hop after the first half window.
func (e *Estimator) due() int {
	if e.full || e.short == nil {
		return e.window
	}
	s := e.short.window
	if e.fill < s {
		return s
	}
	return min(e.window, s+((e.fill-s)/e.hop+1)*e.hop)
}

// onset reports whether the newest hop of the full window is onsetGain
// louder, per sample, than the rest of it.
func (e *Estimator) onset() bool {
	var before, after float64
	cut := e.window - e.hop
	for _, v := range e.buf[:cut] {
		before += v * v
	}
	for _, v := range e.buf[cut:] {
		after += v * v
	}
	return after/float64(e.hop) > onsetGain*(before/float64(cut)+1e-12)
}

// emitShort reads x, the newest half window, and emits its frame, centred
// on it.
func (e *Estimator) emitShort(x []float64, emit func(Frame)) {
	t := (float64(e.fed) - float64(len(x))/2) / e.rate
	e.following()
	e.out = e.short.Analyze(x, e.out[:0])
	e.out = e.avg.average(x, e.out, e.short)
	e.last = t
	e.heard(t, e.short.level, e.out, e.short)
	emit(Frame{Time: t, Span: float64(len(x)) / e.rate, Level: rmsDB(x), Voices: e.out})
}

// whole reads the full window as the frame centred at t. Where the half
// window around the same centre hears more voices, its reading stands: a
// voice with a wide vibrato (a choir's, a section's) or a wandering pitch
// is smeared over a whole window until its partials explain too little to
// pass for a voice, while half the window still holds it nearly steady.
// (More voices than the whole window hears without following: a voice
// followed, follow.go, is kept in either.)
func (e *Estimator) whole(t float64) (f Frame) {
	defer func() { // the voices followed hear of the window read
		by := e
		if f.Span < float64(e.window)/e.rate {
			by = e.short
		}
		e.heard(t, by.level, f.Voices, by)
	}()
	e.following()
	e.out = e.Analyze(e.buf, e.out[:0])
	if e.short == nil {
		e.out = e.avg.average(e.buf, e.out, e)
		return Frame{Time: t, Span: float64(e.window) / e.rate, Level: rmsDB(e.buf), Voices: e.out}
	}
	q := e.window / 4
	mid := e.buf[q : e.window-q]
	e.alt = e.short.Analyze(mid, e.alt[:0])
	if e.halfHearsMore(e.alt, e.out) {
		e.out, e.alt = e.alt, e.out
		e.out = e.avg.average(mid, e.out, e.short)
		return Frame{Time: t, Span: float64(len(mid)) / e.rate, Level: rmsDB(mid), Voices: e.out}
	}
	e.out = e.avg.average(e.buf, e.out, e)
	return Frame{Time: t, Span: float64(e.window) / e.rate, Level: rmsDB(e.buf), Voices: e.out}
}
