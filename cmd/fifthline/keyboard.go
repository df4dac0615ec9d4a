package main

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"

	"fifthline/mts"
	"fifthline/target"
)

// tuningProgram is the tuning program (bank 0) the notes and bulk forms fill
// and the .mid selects; 0 is the one a receiver with a single tuning has.
const tuningProgram = 0

func runKeyboard(e *env, args []string) error {
	fs := newFlags("keyboard")
	mf := addMusicalFlags(fs)
	form := choiceFlag(fs, "mts", "the message form: real-time single-note changes, a bulk tuning dump, or 2-byte scale/octave tuning", "notes", "bulk", "octave")
	format := choiceFlag(fs, "format", "the key-to-spelling table on stdout instead of stderr", "", "table", "csv")
	output := fs.String("output", "", "FILE.syx (the raw messages) or FILE.mid (a Standard MIDI File that sends them)")
	pos, err := parseFlags(e, fs, args)
	if err != nil {
		return err
	}
	if len(pos) > 0 {
		return usagef("keyboard takes no file arguments (got %q); the file goes after --output", pos[0])
	}
	ext := strings.ToLower(filepath.Ext(*output))
	// --format alone asks for the table alone: a player checking what the
	// keys will play before writing the file.
	tableOnly := *output == "" && *format != ""
	if *output == "" && !tableOnly {
		return usagef("keyboard needs --output FILE.syx or FILE.mid (or --format table to see the keys' tuning without writing a file)")
	}
	if !tableOnly && ext != ".syx" && ext != ".mid" {
		return usagef("--output %q: name a .syx or .mid file", *output)
	}
	tu, err := mf.tuning()
	if err != nil {
		return err
	}
	if !tu.Transpose.IsConcert() {
		return usagef("--transpose: a keyboard's tuning is at sounding pitch; leave --transpose out")
	}
	kb := newKeyboard(tu)
	msgs, err := kb.messages(*form)
	if err != nil {
		return err
	}
	data := joinMessages(msgs)
	if ext == ".mid" {
		data = keyboardFile(msgs, *form != "octave")
	}
	if !tableOnly {
		if err := os.WriteFile(*output, data, 0o644); err != nil {
			var pe *os.PathError
			if errors.As(err, &pe) {
				err = pe.Err
			}
			return fmt.Errorf("cannot write %s: %v", *output, err)
		}
	}
	// Said once it worked, so an error stays the only line on stderr.
	mf.say(e.stderr, tu)
	if err := kb.writeTable(e, *format, *form); err != nil {
		return err
	}
	if lo, hi := kb.clamped(); lo+hi > 0 {
		fmt.Fprintf(e.stderr, "%d of the 128 keys (%d at the bottom, %d at the top) lie outside the standard's 8.18–13289.73 Hz and sound at its nearest end\n", lo+hi, lo, hi)
	}
	if !tableOnly {
		fmt.Fprintf(e.stderr, "fifthline: wrote %s: %s\n", *output, describeForm(*form, len(msgs), ext == ".mid"))
	}
	return nil
}

// keyboardFile is the .mid: the messages at time 0, then (for the forms that
// fill a tuning program) that program selected on every channel.
func keyboardFile(msgs [][]byte, selectProgram bool) []byte {
	var t mts.Track
	for _, m := range msgs {
		t.SysEx(0, m)
	}
	if selectProgram {
		t.SelectTuning(0, 0, tuningProgram)
	}
	return t.File(0)
}

func joinMessages(msgs [][]byte) []byte {
	var out []byte
	for _, m := range msgs {
		out = append(out, m...)
	}
	return out
}

func describeForm(form string, n int, mid bool) string {
	var s string
	switch form {
	case "notes":
		s = fmt.Sprintf("128 keys in %d real-time single-note tuning changes to tuning program %d", n, tuningProgram)
	case "bulk":
		s = fmt.Sprintf("a bulk tuning dump of 128 keys into tuning program %d", tuningProgram)
	default:
		return "a 2-byte scale/octave tuning for all 16 channels"
	}
	if mid {
		s += ", selected on all 16 channels (registered parameters 4 and 3)"
	}
	return s
}

// keyboard is a tuning laid on the 128 MIDI keys: each key plays its pitch
// class's spelling from the key's window (MIDI key 60 is C4; common practice).
type keyboard struct {
	tu    target.Tuning
	notes [128]target.Note
	keys  mts.Keys
}

func newKeyboard(tu target.Tuning) *keyboard {
	kb := &keyboard{tu: tu}
	var spelled [12]target.Note
	for _, n := range tu.Window() {
		spelled[n.PitchClass()] = n
	}
	for k := range kb.notes {
		n := spelled[k%12]
		n.Octave = 4
		n.Octave += (k - 60 - n.Semitones()) / 12 // B♯3 is key 60, C♭5 key 71
		kb.notes[k] = n
		kb.keys[k] = mts.FromHz(tu.Target(n))
	}
	return kb
}

// offsets are the pitch classes' cents from equal temperament at A4 = 440 Hz,
// the frame of the scale/octave form, from C4's octave.
func (kb *keyboard) offsets() (off [12]float64) {
	for pc := range off {
		k := 60 + pc
		off[pc] = target.Cents(kb.tu.Target(kb.notes[k]) / (440 * math.Exp2(float64(k-69)/12)))
	}
	return off
}

func (kb *keyboard) messages(form string) ([][]byte, error) {
	switch form {
	case "bulk":
		return [][]byte{mts.BulkDump(mts.AllDevices, tuningProgram, kb.tu.Key.String()+" "+kb.tu.Temperament.Name(), &kb.keys)}, nil
	case "octave":
		m, err := mts.ScaleOctave2(mts.AllDevices, mts.AllChannels, kb.offsets())
		var re *mts.RangeError
		if errors.As(err, &re) {
			n := kb.notes[60+re.PitchClass]
			return nil, usagef("--mts octave reaches only ±100 ¢ from equal temperament at A4 = 440 Hz, and %s lies at %s: use --mts notes or bulk", n.Name(), target.FormatCents(re.Cents, 1))
		}
		return [][]byte{m}, err
	}
	return mts.SingleNoteChanges(mts.AllDevices, tuningProgram, &kb.keys), nil
}

// clamped counts the keys whose targets the standard's range cannot hold.
func (kb *keyboard) clamped() (lo, hi int) {
	for _, n := range kb.notes {
		switch mts.Outside(kb.tu.Target(n)) {
		case -1:
			lo++
		case 1:
			hi++
		}
	}
	return lo, hi
}
