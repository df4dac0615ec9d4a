package main

import (
	"cmp"
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"slices"
	"strconv"
	"strings"
	"time"
	"unicode"

	"fifthline/capture"
	"fifthline/ensemble"
	"fifthline/harmony"
	"fifthline/journal"
	"fifthline/pitchdetect"
	"fifthline/session"
	"fifthline/target"
)

// --players: one player per channel of a multichannel recording or
// interface, each read from their own channel knowing the others (package
// ensemble), and with --chords the chords they make.

// playerColumns follow the held-note columns.
var playerColumns = []string{driftColumn, "player", "channel"}

// addPlayersFlag defines --players; call it before addVoiceFlags, which
// shares --chords and --seventh with it.
func addPlayersFlag(fs *flag.FlagSet) *string {
	addReferenceFlag(fs)
	return fs.String("players", "", "one player per channel, in channel order (vc,vla,vl2,vl1; an empty name skips a channel) or picked (3=vla,1=vc); notes gain player and channel columns")
}

// playerOptions are the checked --players flags.
type playerOptions struct {
	players []ensemble.Player
	// onInterface[i] is the interface channel (from 1) of the source's
	// channel i once carried has picked them; nil: the source's own.
	onInterface []int
	chords      bool
	seventh     float64
	group       bool // --reference group
}

// playersOptions checks --players and the chord flags; ok is false when
// --players was not given.
func playersOptions(fs *flag.FlagSet, value string) (opt playerOptions, ok bool, err error) {
	// --player vc,vla is --players vc,vla missing its s: one name for the
	// journal would read only the first channel, as one player.
	if p := fs.Lookup("player"); p != nil && !wasSet(fs, "players") && strings.Contains(p.Value.String(), ",") {
		return opt, false, usagef("--player %q names one player, for the journal; one player per channel is --players %s", p.Value.String(), p.Value.String())
	}
	if opt.group, err = groupReference(fs, wasSet(fs, "players")); err != nil || !wasSet(fs, "players") {
		return opt, false, err
	}
	if err := spacedPlayers(value); err != nil {
		return opt, false, err
	}
	if opt.players, err = ensemble.ParsePlayers(value); err != nil {
		return opt, false, usagef("%v", err)
	}
	opt.chords = fs.Lookup("chords").Value.String() == "true"
	if opt.seventh, err = target.ParseSeventh(fs.Lookup("seventh").Value.String()); err != nil {
		return opt, false, usagef("%v", err)
	}
	return opt, true, nil
}

// spacedPlayers refuses a --players value that may be a list parted by
// spaces or semicolons, as no comma or = parts it. "vc;vla" is one: no name
// holds a semicolon. "vc vla vl2 vl1" may be four players or one player of
// that name ("first violin"); read as one, a list would hear one channel
// and name no chord, so the error gives both ways to say it (one player is
// --player's). A name with a space beside another name ("first
// violin,viola") or a channel ("3=first violin") is a name, as the
// contract parts names by commas.
func spacedPlayers(value string) error {
	if strings.ContainsAny(value, ",=") {
		return nil
	}
	words := strings.FieldsFunc(value, func(r rune) bool { return r == ';' || unicode.IsSpace(r) })
	switch {
	case len(words) < 2:
		return nil
	case strings.Contains(value, ";"):
		return usagef("--players %q: part the names with commas, one per channel: --players %s", value, strings.Join(words, ","))
	}
	return usagef("--players %q: names are parted by commas; for %d players, --players %s; for one player, --player %q (--channel N picks the channel)",
		value, len(words), strings.Join(words, ","), strings.Join(words, " "))
}

// playerNote is one player's note with the columns --players adds.
type playerNote struct {
	ensemble.Note
	drift float64 // the group's drift at the note, cents
	known bool
	heard time.Time // when its end was heard live (heldRows)
}

func (n playerNote) record(withFile bool) []string {
	return append(n.Record(withFile), n.driftField(), n.Player.Name, strconv.Itoa(n.Player.Channel+1))
}

// playerNoteJSON is a player's note in JSON: the note's fields and whose.
type playerNoteJSON struct {
	noteJSON
	GroupDrift *json.Number `json:"group_drift_cents"` // null where not known
	Player     string       `json:"player"`
	Channel    int          `json:"channel"`
}

func (n playerNote) json(withFile bool) playerNoteJSON {
	var drift *json.Number
	if n.known {
		d := number(n.drift, 2)
		drift = &d
	}
	return playerNoteJSON{newNoteJSON(n.Event, withFile), drift, n.Player.Name, n.Player.Channel + 1}
}

// chordRecords are a chord's rows, one per member, lowest first, as the
// contract's chord rows with the player column.
func chordRecords(c ensemble.Chord, path string) []chordJSON {
	var out []chordJSON
	for i, m := range c.Members {
		row := newChordJSON(path, c.Start, c.End, c.HeardChord, m)
		row.Player = c.Players[i].Name
		out = append(out, row)
	}
	return out
}

// logChords writes the chords' memberships to the journal, each under its
// player's name and channel, as the player's note rows are.
func (po *playerOptions) logChords(j *journalSink, source string, tu target.Tuning, chords []ensemble.Chord, start time.Time) {
	for _, c := range chords {
		j.chord(source, tu, c.Start, c.End, c.HeardChord, func(i int) (string, journal.Extra) {
			return c.Players[i].Name, journal.Extra{Channel: po.channel(c.Players[i])}
		}, start)
	}
}

// playersChordHeader is the contract's chord row with the player column.
func playersChordHeader(withFile bool) []string {
	h := chordHeader(withFile)
	return append(h[:len(h)-1], "player")
}

// analyzePlayers reads every file's players and writes their notes (or
// chord rows) ordered by start.
func analyzePlayers(e *env, po playerOptions, files []string, tu target.Tuning, opt analyzeOptions, jf *journalFlags) error {
	withFile := len(files) > 1
	head := groupHead(withFile, po.chords, playerColumns, playersChordHeader)
	return analyzeGroup(e, "--players", files, tu, opt, jf, head, func(path string, out *rowWriter, j *journalSink) (string, bool, error) {
		notes, chords, err := readPlayers(e, path, tu, po, opt, j)
		if err == nil {
			evs := make([]session.Event, len(notes))
			for k, n := range notes {
				evs[k] = n.Event
			}
			opt.warnTuning(e, path, tu, evs)
		}
		td := takeDrift(notes, tu, po.seventh)
		if po.chords {
			for _, c := range chords {
				for _, row := range chordRecords(c, fileColumn(path, withFile)) {
					out.write(row.record(withFile), row)
				}
			}
		} else {
			for _, n := range driftNotes(notes, td, tu, po.group) {
				out.write(n.record(withFile), n.json(withFile))
			}
		}
		return td.Words(), notes == nil, err
	})
}

// learnSeconds is how much of a take the learning pass reads: enough for
// every pair of microphones a player's steady notes to learn from, and the
// reading pass goes on learning (as live listening does), so a long
// rehearsal is not read twice over.
const learnSeconds = 60

// readPlayers hears one file's players twice: once (its first
// learnSeconds) to learn what each microphone hears of the others, then to
// read every note with that known from the first on. Notes come back
// ordered by start, then channel.
func readPlayers(e *env, path string, tu target.Tuning, po playerOptions, opt analyzeOptions, j *journalSink) ([]ensemble.Note, []ensemble.Chord, error) {
	var learned ensemble.Bleed
	var notes []ensemble.Note
	var start time.Time
	var runErr error
	tracks := make([]harmony.Track, len(po.players))
	var progress *progress // one bar over both passes
	for pass := range 2 {
		rec, err := capture.OpenRecording(path, 1)
		if err != nil {
			return nil, nil, err
		}
		if err := ensemble.CheckChannels(po.players, rec.Channels(), path); err != nil {
			rec.Close()
			return nil, nil, usagef("%v", err)
		}
		start = takeStart(opt.recorded, rec)
		learn := min(rec.Duration(), learnSeconds)
		if progress == nil {
			progress = newProgress(e.stderr, path, learn+rec.Duration())
		}
		o := ensemble.Options{Name: path, Players: po.players, Tunings: session.NewTunings(tu), Bleed: &learned}
		if pass == 1 {
			o.OnNote = func(n ensemble.Note) error {
				notes = append(notes, n)
				return nil
			}
			o.OnFrame = func(i int, est pitchdetect.Estimate) { tracks[i].Add(est.Time, est.Hz) }
		}
		pm := &progressMulti{Recording: rec, p: progress, from: float64(pass) * learn, upTo: -1}
		if pass == 0 {
			pm.upTo = int(learn * rec.SampleRate())
		}
		err = ensemble.Run(e.ctx, pm, o)
		rec.Close()
		if pass == 1 || err != nil {
			progress.Done()
		}
		if runErr = err; err != nil {
			break
		}
	}
	sortPlayerNotes(notes)
	// The chords heard before an interruption too; they spell their
	// members' notes before the notes are journaled.
	chords := ensemble.Chords(notes, tracks, po.players, tu, po.seventh)
	spellPlayersFromChords(notes, chords)
	for _, n := range notes {
		po.logNote(j, n, start)
	}
	if !po.chords {
		chords = nil
	}
	po.logChords(j, path, tu, chords, start)
	switch {
	case errors.Is(runErr, context.Canceled):
		return notes, chords, fmt.Errorf("%s: %w", path, errInterrupted)
	case runErr != nil:
		return notes, chords, fmt.Errorf("%s: %w", path, runErr)
	}
	return notes, chords, nil
}

func sortPlayerNotes(notes []ensemble.Note) {
	slices.SortStableFunc(notes, func(a, b ensemble.Note) int {
		return cmp.Or(cmp.Compare(a.Held.Start, b.Held.Start), cmp.Compare(a.Player.Channel, b.Player.Channel))
	})
}

// progressMulti reports how far the reading is as it reads, and ends the
// recording early at upTo frames (-1: its end).
type progressMulti struct {
	*capture.Recording
	p    *progress
	from float64 // seconds of the bar already done (the learning pass)
	read int
	upTo int
}

func (pm *progressMulti) ReadChannels(dst [][]float32) (int, error) {
	if pm.upTo >= 0 {
		if pm.read >= pm.upTo {
			return 0, io.EOF
		}
		if left := pm.upTo - pm.read; left < len(dst[0]) {
			short := make([][]float32, len(dst))
			for c := range dst {
				short[c] = dst[c][:left]
			}
			dst = short
		}
	}
	n, err := pm.Recording.ReadChannels(dst)
	pm.read += n
	pm.p.At(pm.from + float64(pm.read)/pm.SampleRate())
	return n, err
}

// carried are the interface channels the players are on, counted from 1,
// in the order a live input delivers them; each player's Channel becomes
// their place in it.
func (po *playerOptions) carried() []int {
	var chans []int
	for i, p := range po.players {
		chans = append(chans, p.Channel+1)
		po.players[i].Channel = i
	}
	po.onInterface = chans
	return chans
}

// channel is where a player sits, counted from 1 as the interface or the
// file numbers its channels.
func (po *playerOptions) channel(p ensemble.Player) int {
	if po.onInterface != nil {
		return po.onInterface[p.Channel]
	}
	return p.Channel + 1
}

// logNote journals a player's note with their channel (start as for
// journalSink.noteAt).
func (po *playerOptions) logNote(j *journalSink, n ensemble.Note, start time.Time) {
	j.row(n.Event, journal.Extra{Channel: po.channel(n.Player)}, start)
}

// logHeard journals a player's note heard live, at its place on the
// capture's clock however long its row waited for its chords.
func (po *playerOptions) logHeard(j *journalSink, pn playerNote) {
	j.heardRow(pn.Event, journal.Extra{Channel: po.channel(pn.Player)}, pn.heard)
}

// listenPlayers is listen --plain --players: the CSV header, then each
// player's held note as it ends, flushed at once; with --chords each
// chord's rows instead, as soon as no note still sounding can change the
// chord. start_s counts from the start of capture.
func listenPlayers(ctx context.Context, e *env, src *capture.Input, name string, tu target.Tuning, po playerOptions, j *journalSink) error {
	w, timing, err := beginPlain(e, groupHead(false, po.chords, playerColumns, playersChordHeader), src.SampleRate())
	if err != nil {
		return err
	}
	defer timing.close()
	var chordRows func(ensemble.Chord, target.Tuning) error
	if po.chords {
		chordRows = func(c ensemble.Chord, tu target.Tuning) error {
			po.logChords(j, name, tu, []ensemble.Chord{c}, time.Time{})
			for _, row := range chordRecords(c, "") {
				w.Write(row.record(false))
			}
			w.Flush()
			return w.Error()
		}
	}
	// Each note's row once its chords are known (heldrows.go), spelled
	// from them as analyze spells it; the journal keeps the fixed
	// reference.
	chords := po.liveChords(session.NewTunings(tu), chordRows, func(pn playerNote) error {
		po.logHeard(j, pn)
		if po.chords {
			return nil
		}
		pn = withDrift(pn.Note, tu, pn.drift, pn.known, po.group)
		pn.Player.Channel = po.channel(pn.Player) - 1 // as printed on the interface
		w.Write(pn.record(false))
		w.Flush()
		return w.Error()
	})
	drift := ensemble.NewDrift(tu, po.seventh)
	o := ensemble.Options{Name: name, Players: po.players, Tunings: session.NewTunings(tu),
		OnNote: func(n ensemble.Note) error {
			c, known := drift.Cents()
			return chords.note(playerNote{Note: n, drift: c, known: known})
		},
		OnFrame: func(i int, est pitchdetect.Estimate) {
			timing.playerFrame(po.players[i].Name, est)
			drift.Frame(i, est)
			chords.frame(i, est)
		},
		OnSounding: chords.sound}
	byChannel := make([]string, src.Channels())
	for _, p := range po.players {
		byChannel[p.Channel] = p.Name
	}
	err = ensemble.Run(ctx, timing.withClock(src, src, byChannel), o)
	// The chords and rows still open when listening stopped.
	return cmp.Or(err, chords.ready(true), w.Error())
}
