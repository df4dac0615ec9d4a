package pitchdetect

import "slices"

// The steady part's margins for a reader other than the Detector
// (Segmenter.Margin).

// ends is where the steady part of the note h (frames fr) may begin and
// end, before a slur is taken into account.
func (s *Segmenter) ends(fr []Estimate, h Held) (lo, hi float64) {
	if s.Margin <= 0 {
		return h.Start + s.Window, h.End - s.Window
	}
	return h.Start + s.Margin, s.released(fr) - s.Margin
}

// margin is what each end of a note sets aside from its steady part.
func (s *Segmenter) margin() float64 {
	if s.Margin > 0 {
		return s.Margin
	}
	return s.Window
}

// releaseDB: a partial fitted on a Hann window half past its offset has
// half its amplitude, 6 dB down (the window's two halves weigh alike).
const releaseDB = 6.0

// released is the time of the last of fr within releaseDB of their median
// level: where the window's centre passes the offset, the release after it
// (a choir's rings on for half a second, reading sharp) left out.
func (s *Segmenter) released(fr []Estimate) float64 {
	s.lohi = s.lohi[:0]
	for _, e := range fr {
		s.lohi = append(s.lohi, e.Level)
	}
	slices.Sort(s.lohi)
	floor := s.lohi[len(s.lohi)/2] - releaseDB
	for i := len(fr) - 1; i > 0; i-- {
		if fr[i].Level >= floor {
			return fr[i].Time
		}
	}
	return fr[0].Time
}
