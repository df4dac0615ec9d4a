package main

// span is when a note below sounds: from its start to its end (+Inf for a
// track still sounding).
type span struct{ from, to float64 }

// numbered is the voice number of a note beginning at start over the notes
// below it that may sound then (below): one more than the most of them
// sounding at one instant between start and start+together. Counting them
// at one instant counts each voice once: a voice whose note ends just
// after start and whose next note begins a hop later is one voice, not two.
// The number is capped at the voices the contract numbers (--voices N, up
// to 4): one microphone can hold more notes at once than voices (a voice
// held as lost while another's next note begins, a partial read for a
// voice), and a "voice 5" belongs to no voice the frames hold. Measured:
// FluidR3's string quartet of voicenumber_test.go heard live through a
// null sink gave a C6 (a phantom over the F major's F3, C4, A4 and the
// held F4) as voice 5.
func (tr *tracker) numbered(below []span, start, together float64) int {
	most := 0
	// A note ending at start sounds then; one ending as another begins
	// later has made way for it.
	count := func(at float64, endsIn bool) {
		n := 0
		for _, s := range below {
			if s.from <= at && (at < s.to || endsIn && at == s.to) {
				n++
			}
		}
		most = max(most, n)
	}
	count(start, true)
	for _, s := range below {
		if s.from > start && s.from <= start+together {
			count(s.from, false)
		}
	}
	limit := tr.most
	if limit == 0 {
		limit = heardVoices
	}
	return min(most+1, limit)
}
