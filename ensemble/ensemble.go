package ensemble

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"

	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/source"
)

// Player is one member of the group and the channel of their microphone.
type Player struct {
	Name    string
	Channel int // counted from 0 in the source
}

// Note is one player's held note, read from their own channel.
type Note struct {
	Player Player
	session.Event
}

// Options configure Run. Window and Hop are in samples; 0 lets the detector
// choose. OwnDB 0 means DefaultOwnDB. An error from OnNote stops Run.
type Options struct {
	Name        string // what is heard, for Event.Source: a file or a device
	Players     []Player
	Tunings     *session.Tunings
	Window, Hop int
	OwnDB       float64
	Bleed       *Bleed // nil: learn afresh
	OnNote      func(Note) error
	// OnFrame, if set, sees every player's frame as their notes are read
	// from it: unvoiced where the pitch was another player's bleed. Index i
	// is Players[i]; every player's frame of a moment comes, in player
	// order, before the next moment's. A moment waits while a player's
	// frame in it is held back (attack.go: up to attackFrames hops), so a
	// frame taken back is seen with its pitch.
	OnFrame func(i int, e pitchdetect.Estimate)
	// OnSounding, if set, hears after each moment, before its frames go
	// to OnFrame, of each player's note still sounding once it is sure to
	// be given as a note beginning at start (pitchdetect's
	// Segmenter.Sounding), through the time of its last frame; ok is false
	// for none. A chord over a pedal can then be read before the pedal
	// ends. settles says whether where its reading begins is known yet,
	// settled (pitchdetect's Segmenter.Settles): the chord it enters on is
	// read from there.
	OnSounding func(i int, start, through float64, ok bool, settled float64, settles bool)
}

// voice is one player's reading chain.
type voice struct {
	Player
	det     *pitchdetect.Detector
	seg     *pitchdetect.Segmenter
	ring    []float64 // the latest window of the player's channel, as heard
	w       int       // next write position in ring
	clean   []float32 // this block less what the channel hears of the others
	est     []pitchdetect.Estimate
	last    float64                // the previous frame's pitch, 0 when unvoiced
	same    int                    // frames in a row at that pitch (or silent)
	held    []pitchdetect.Estimate // frames given away as bleed, held back (attack.go)
	decided []pitchdetect.Estimate // frames the segmenter has, not yet handed to OnFrame
	note    float64                // the pitch of the note the held frames began in; 0: at an onset
	spilled bool                   // held frames were given away for want of room
	low     *lowBand               // the channel below the neighbours' partials (lowband.go)
	cur     pitchdetect.Estimate   // this frame as read
	cut     float64                // where cur was read below (Hz), 0: read whole
	blanked bool                   // cur was given away as another's bleed
	floor   float64                // the channel's quietest level since its player last played, dBFS (plain.go)
	lowRead bool                   // the last frame was the player's, read from low
	recent  float64                // the player's latest pitch heard within a window, 0: none
	age     int                    // frames since it was heard
	run     int                    // frames in a row the player has been heard
	since   int                    // frames since the player's latest note was first heard (onset)
	ghost   float64                // the pitch last given away as that note's period with the bleed (phantom.go), 0: none
}

// ownEvery: the channels' spectra for the ownership test and the bleed
// evidence are taken every second frame (the detector's hop is an eighth
// of a window, so consecutive spectra share most of their samples); they
// cost most of the reading otherwise (measured: 70 % of the time).
const ownEvery = 2

// steadyFrames is how many frames in a row a player must keep one pitch,
// or silence, before their channel is weighed for bleed: a window's worth
// at the detector's default hop of an eighth of a window.
const steadyFrames = 8

// steady notes the frame's pitch and tells whether the player has held it
// (within steadyCents) or stayed silent for steadyFrames frames.
func (v *voice) steady(hz float64) bool {
	const steadyCents = 20
	switch {
	case hz == 0 && v.last == 0, hz > 0 && v.last > 0 && math.Abs(1200*math.Log2(hz/v.last)) < steadyCents:
		v.same++
	default:
		v.same = 0
	}
	v.last = hz
	return v.same >= steadyFrames
}

// Run reads src until it ends (io.EOF) or ctx is cancelled, delivering each
// player's held notes as they end. Notes still held at the end are
// finished and delivered, so nothing heard is lost. A finished stream
// returns nil; cancellation returns ctx.Err().
func Run(ctx context.Context, src source.Multi, opt Options) error {
	if len(opt.Players) == 0 {
		return errors.New("ensemble: no players")
	}
	ownDB := opt.OwnDB
	if ownDB == 0 {
		ownDB = DefaultOwnDB
	}
	voices := make([]*voice, len(opt.Players))
	for i, p := range opt.Players {
		if p.Channel < 0 || p.Channel >= src.Channels() {
			return fmt.Errorf("ensemble: %s on channel %d, but the source has %d", p.Name, p.Channel+1, src.Channels())
		}
		det, err := pitchdetect.New(src.SampleRate(), opt.Window, opt.Hop)
		if err != nil {
			return err
		}
		det.NoReread() // its segmenter reads no frame again
		low, err := newLowBand(det)
		if err != nil {
			return err
		}
		voices[i] = &voice{Player: p, det: det, seg: pitchdetect.NewSegmenter(float64(det.Hop()) / src.SampleRate()),
			ring: make([]float64, det.Window()), clean: make([]float32, det.Hop()), low: low, floor: math.Inf(1)}
	}
	hop := voices[0].det.Hop()
	owner := NewOwner(src.SampleRate(), voices[0].det.Window(), len(voices))
	bleed := opt.Bleed.model(voices[0].det.Window(), len(voices))
	hist := newHistory(len(voices), src.SampleRate())
	heard := make([][]float32, len(voices)) // each player's channel, this block
	cleaned := make([][]float32, len(voices))
	for i, v := range voices {
		cleaned[i] = v.clean
	}
	fr := newFrameReadings(len(voices))
	recent := fr.recent
	frame := 0
	blocks, view := make([][]float32, src.Channels()), make([][]float32, src.Channels())
	for c := range blocks {
		blocks[c] = make([]float32, hop)
	}
	deliver := func(v *voice, h pitchdetect.Held) error {
		if opt.OnNote == nil {
			return nil
		}
		tu := opt.Tunings.Get()
		return opt.OnNote(Note{Player: v.Player, Event: session.Event{Source: opt.Name, Player: v.Name, Held: h, Reading: tu.Classify(h.Hz), Tuning: tu}})
	}
	finish := func() error {
		var errs []error
		for _, v := range voices {
			errs = append(errs, v.release(deliver))
			if h, ok := v.seg.Flush(); ok {
				errs = append(errs, deliver(v, h))
			}
		}
		decided(voices, opt.OnFrame)
		return errors.Join(errs...)
	}
	for {
		if err := ctx.Err(); err != nil {
			return errors.Join(finish(), err)
		}
		n, rerr := readFull(src, blocks, view)
		for i, v := range voices {
			heard[i] = blocks[v.Channel][:n]
		}
		hist.push(heard)
		bleed.cleanAll(hist, cleaned)
		for i, v := range voices {
			v.feed(heard[i], v.clean[:n])
		}
		hist.shift()
		// Every detector was fed the same samples, so all hold the same
		// number of estimates, frame for frame.
		for j := range voices[0].est {
			frame++
			fresh := false
			switch {
			case !anyVoiced(voices, j):
				owner.Reset()
			case frame%ownEvery == 0 || !owner.have[0]:
				// The rings end where this block ends; with blocks of one
				// hop that is where the estimate's window ends.
				owner.Reset()
				for k, u := range voices {
					owner.Set(k, u.ring[u.w:], u.ring[:u.w])
				}
				fresh = true
			}
			for i, v := range voices {
				fr.level[i] = v.est[j].Level
			}
			for i, v := range voices {
				v.cur, v.cut = v.entry(v.est[j], i, fr.level, recent, func(d int) bool { return !bleed.weighed(i, d) })
				fr.read[i] = v.cur.Hz
			}
			for i, v := range voices {
				// A period shared with bleed not yet weighed, or in a note's
				// attack, is the note above (phantom.go); below the
				// neighbours' partials none is shared.
				unweighed := func(d int) bool { return !bleed.weighed(i, d) }
				if k := owner.phantom(i, v.cur.Hz, fr.read, unweighed); k > 1 && v.cut == 0 {
					v.cur.Hz *= float64(k)
				} else if v.cut == 0 && (owner.phantomOnPartial(i, v.cur.Hz, fr.read, unweighed, ownDB) ||
					v.sharedPeriod(i, v.cur.Hz, fr.read, unweighed)) {
					v.cur = unvoiced(v.cur)
				}
				skip := owner.weighedSkip(i, v.cur.Hz, v.cut, fr.read)
				v.blanked = v.cur.Voiced && owner.louderElsewhere(i, v.cur.Hz, skip, ownDB) &&
					!owner.beyondBleed(i, v.cur.Hz, skip, ownDB, bleed)
				v.lowRead = v.cut > 0 && !v.blanked
				fr.hz[i] = v.cur.Hz
				if v.blanked {
					fr.hz[i] = 0
				}
			}
			for i, v := range voices {
				prev := v.last
				fr.steady[i] = v.steady(fr.hz[i])
				var err error
				if v.plainly(owner, voices, i, v.cur, fr.hz, prev) {
					err = v.giveAway(v.cur, deliver)
				} else {
					err = v.push(v.cur, v.blanked, prev, deliver)
				}
				if err != nil {
					return err
				}
			}
			for i, v := range voices {
				v.onset(fr.hz[i], recent[i])
				recent[i] = v.recentPitch(fr.hz[i])
				if v.run++; fr.hz[i] == 0 {
					v.run = 0
				}
			}
			if fresh {
				bleed.observe(owner, fr)
			}
			if opt.OnSounding != nil {
				for i, v := range voices {
					start, through, ok := v.seg.Sounding()
					settled, settles := 0.0, false
					if ok {
						settled, settles = v.seg.Settles()
					}
					opt.OnSounding(i, start, through, ok, settled, settles)
				}
			}
			decided(voices, opt.OnFrame)
		}
		if rerr != nil {
			ferr := finish()
			if errors.Is(rerr, io.EOF) {
				return ferr
			}
			return errors.Join(rerr, ferr)
		}
	}
}

func anyVoiced(voices []*voice, j int) bool {
	for _, v := range voices {
		if v.est[j].Voiced {
			return true
		}
	}
	return false
}

// feed gives the voice a block: its detector reads the block cleaned of
// the others' bleed, and its ring keeps the block as heard, for the
// ownership test and the bleed estimate.
func (v *voice) feed(heard, cleaned []float32) {
	v.est = v.det.Feed(cleaned, v.est[:0])
	v.low.add(cleaned)
	for _, s := range heard {
		v.ring[v.w] = float64(s)
		v.w++
		if v.w == len(v.ring) {
			v.w = 0
		}
	}
}

// readFull fills every channel's block to its length unless the source
// ends or fails first, so that each hop's estimates and windows line up.
func readFull(src source.Multi, blocks, view [][]float32) (int, error) {
	n, idle := 0, 0
	for n < len(blocks[0]) {
		for c := range blocks {
			view[c] = blocks[c][n:]
		}
		k, err := src.ReadChannels(view)
		n += k
		if err != nil {
			return n, err
		}
		if idle = idle + 1; k > 0 {
			idle = 0
		} else if idle > 100 {
			return n, io.ErrNoProgress // a source that never blocks and never delivers
		}
	}
	return n, nil
}
