package pitchdetect

import (
	"cmp"
	"math"
	"slices"
)

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

// steady returns the frames fr[i:j] timed within lo..hi, else within
// lo..quick, or for a note too short to have three such frames, the three
// nearest the middle of lo..quick.
func steady(fr []Estimate, lo, hi, quick float64) (i, j int) {
	byTime := func(e Estimate, t float64) int { return cmp.Compare(e.Time, t) }
	within := func(hi float64) (int, int) {
		i, _ := slices.BinarySearchFunc(fr, lo, byTime)
		j, _ := slices.BinarySearchFunc(fr, hi, byTime)
		for j < len(fr) && fr[j].Time <= hi {
			j++
		}
		return i, j
	}
	if len(fr) <= 3 {
		return 0, len(fr)
	}
	if i, j = within(hi); j-i >= 3 {
		return i, j
	}
	if i, j = within(quick); j-i >= 3 {
		return i, j
	}
	m, _ := slices.BinarySearchFunc(fr, (lo+quick)/2, byTime)
	i = min(max(m-1, 0), len(fr)-3)
	return i, i + 3
}

func meanStd(x []float64) (mean, sd float64) {
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	for _, v := range x {
		sd += (v - mean) * (v - mean)
	}
	return mean, math.Sqrt(sd / float64(len(x)))
}

// median is the median of c.
func (s *Segmenter) median(c []float64) float64 {
	s.lohi = append(s.lohi[:0], c...)
	slices.Sort(s.lohi)
	n := len(s.lohi)
	return (s.lohi[(n-1)/2] + s.lohi[n/2]) / 2
}

// beforeRelease is fr up to the last frame within releaseDB of their median
// level (released): whether a note ending in silence moved one way only is
// told by its sound, not by its release, whose last frames wander a few
// tenths of a cent as they fade (FluidR3's trumpet's C4 sixteenth, last of
// a run, rising 18 ¢ and held for its last frames, had its pitch from those
// 4 frames, 9.1 ¢ above its sound's median, for a step back of 0.33 ¢ at
// −62 dB; 2.5 ¢ read as a drift, by its median: measured).
func (s *Segmenter) beforeRelease(fr []Estimate) []Estimate {
	rel := s.released(fr)
	k := len(fr)
	for k > 1 && fr[k-1].Time > rel {
		k--
	}
	return fr[:k]
}
