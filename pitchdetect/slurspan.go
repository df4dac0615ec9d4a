package pitchdetect

import "math"

// throughSlurs is the pitch of the finished note h, next the first frame's
// time of the note slurred on from it (0 if none). A note slurred between
// two others that sounds less than turningSeconds reads midway (in cents)
// between summarise's reading, its middle, and the median of its frames
// over the whole span it sounds, read again through both slurs (spanHz).
// Either alone misses part of what a listener hears: FluidR3's quick runs
// on five instruments (cmd/fifthline's legato tests) over the hop's eight
// phases read 1148 of 1536 notes within 2 ¢ of their sound's median pitch
// by the middle alone, 1218 by the span alone, 1251 midway between the
// two (measured).
func (s *Segmenter) throughSlurs(h Held, next float64) float64 {
	span, ok := s.spanHz(h, next)
	if !ok {
		return h.Hz
	}
	return math.Sqrt(h.Hz * span)
}

// spanFrame is a frame between the last note's last frame and the next
// note's first: its time, the open note's reading of it (or the note's
// median where it has none), and the power of the open note's partials in
// it, both neighbours' left out.
type spanFrame struct {
	at, hz, power float64
	own           bool
}

// spanHz is the median pitch of the frames of the note h (slurred from
// s.from, on to a note first heard at next) over the span it sounds
// (sounding), each read again (Reread) near the note's own reading of it:
// in a frame whose window reaches past the last note's last frame or the
// span's end (by half a Window, see summarise) with that note's partials
// left out. A frame that reads no series this way keeps its own reading,
// if it has one.
func (s *Segmenter) spanHz(h Held, next float64) (float64, bool) {
	if s.Reread == nil || s.from.hz == 0 || next == 0 || (h.End+next)/2-(s.from.last+h.Start)/2 >= turningSeconds {
		return 0, false
	}
	s.jc = s.jc[:0]
	for _, e := range s.frames {
		s.jc = append(s.jc, e.Hz)
	}
	ref := s.median(s.jc)
	fr, first, end, ok := s.sounding(h, next, ref)
	if !ok {
		return 0, false
	}
	s.jc = s.jc[:0]
	for _, f := range fr[first:] {
		if f.at > end+s.Hop/4 {
			break
		}
		var under, over float64
		if f.at < s.from.last+s.Window/2 {
			under = s.from.hz
		}
		if f.at > end-s.Window/2 {
			over = s.nextHz
		}
		if r, _, ok := s.Reread(f.at, f.hz, under, over); ok && math.Abs(1200*math.Log2(r/ref)) <= s.JumpCents {
			s.jc = append(s.jc, 1200*math.Log2(r/ref))
		} else if f.own {
			s.jc = append(s.jc, 1200*math.Log2(f.hz/ref))
		}
	}
	if len(s.jc) < 3 {
		return 0, false
	}
	return ref * math.Exp2(s.median(s.jc)/1200), true
}

// sounding finds the span the note h (median pitch ref) sounds: the frames
// from the last note's last frame to the next note's first (fr), from the
// first (first) whose partials of the note come within releaseDB of their
// median power over the note's own frames (a window's centre passing an
// onset or an offset weighs the note by half: see released), to the last
// such (end, its time), and no later than the frame after the next note's
// first that reads as a series of its own on to next, nor than the middle
// of the slur into it. (Ending at that first frame instead, a trumpet's
// sixteenths, rising through their length, lost 7 of 128 within 2 ¢ of
// their sound's median pitch over the hop's phases and the violin's
// gained 4; FluidR3, measured.) The power is weighted as the readings
// weigh the partials (power times k², see stray.go).
func (s *Segmenter) sounding(h Held, next, ref float64) (fr []spanFrame, first int, end float64, ok bool) {
	fr = s.span[:0]
	k := 0 // the note's first frame not before at
	// Frames come a hop apart: stepping from the last note's last frame
	// meets each frame's time (within a quarter hop, Reread's match).
	for at := s.from.last + s.Hop; at < next-s.Hop/4; at += s.Hop {
		for k < len(s.frames) && s.frames[k].Time < at-s.Hop/4 {
			k++
		}
		f := spanFrame{at: at, hz: ref, own: k < len(s.frames) && math.Abs(s.frames[k].Time-at) < s.Hop/4}
		if f.own {
			f.hz = s.frames[k].Hz
		}
		if _, pw, ok := s.Reread(at, f.hz, s.from.hz, s.nextHz); ok {
			f.power = pw
		}
		fr = append(fr, f)
	}
	s.span = fr
	s.lohi = s.lohi[:0]
	for _, f := range fr {
		if f.own {
			s.lohi = append(s.lohi, f.power)
		}
	}
	if len(s.lohi) == 0 {
		return fr, 0, 0, false
	}
	level := s.median(s.lohi) * math.Pow(10, -releaseDB/10)
	first, last := -1, -1
	for i, f := range fr {
		if f.power >= level {
			if first < 0 {
				first = i
			}
			last = i
		}
	}
	if last < 0 {
		return fr, 0, 0, false
	}
	heard := next
	for at := next - s.Hop; at > h.Start+s.Hop/4; at -= s.Hop {
		if r, _, ok := s.Reread(at, s.nextHz, ref, 0); !ok || math.Abs(1200*math.Log2(r/s.nextHz)) > s.JumpCents {
			break
		}
		heard = at
	}
	end = min(fr[last].at, heard+s.Hop, (h.End+next)/2)
	return fr, first, end, true
}
