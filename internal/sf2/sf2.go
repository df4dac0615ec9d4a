// Package sf2 reads the sample headers, instruments and 16-bit sample data
// of a SoundFont 2 file (SoundFont Technical Specification 2.04, E-mu
// Systems, 1996: RIFF "sfbk" with "sdta"/"smpl" and the "pdta" hydra).
//
// It exists so pitch tests can take real instrument timbres with exact
// truth from a sample's loop; it is not a synthesiser and ignores
// modulators, envelopes, presets and 24-bit extensions.
package sf2

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
)

// Sample is one sample header ("shdr" record). Offsets count sample frames
// from the start of the smpl chunk; the loop is [LoopStart, LoopEnd).
type Sample struct {
	Name               string
	Start, End         uint32
	LoopStart, LoopEnd uint32
	Rate               uint32
	OriginalPitch      uint8 // MIDI key
	Correction         int8  // cents
	Type               uint16
}

// Instrument is an instrument name with the zones that play samples.
type Instrument struct {
	Name  string
	Zones []Zone
}

// Zone is one instrument zone's sample and the generators that say what
// pitch the sample has (spec section 8.1.2).
type Zone struct {
	Sample  int // index into Font.Samples
	RootKey int // overridingRootKey (generator 58), or -1 when absent
}

// Font is an opened SoundFont; sample data is read on demand.
type Font struct {
	r           io.ReaderAt
	smplOff     int64
	smplFrames  int64
	Samples     []Sample
	Instruments []Instrument
}

// Open parses the RIFF structure and the hydra of a SoundFont of size bytes.
func Open(r io.ReaderAt, size int64) (*Font, error) {
	var hdr [12]byte
	if _, err := r.ReadAt(hdr[:], 0); err != nil {
		return nil, fmt.Errorf("sf2: reading header: %w", err)
	}
	if string(hdr[0:4]) != "RIFF" || string(hdr[8:12]) != "sfbk" {
		return nil, errors.New("sf2: not a SoundFont (no RIFF sfbk header)")
	}
	end := min(int64(binary.LittleEndian.Uint32(hdr[4:8]))+8, size)
	f := &Font{r: r}
	var pdta []byte
	for off := int64(12); off+12 <= end; {
		var ch [12]byte
		if _, err := r.ReadAt(ch[:], off); err != nil {
			return nil, fmt.Errorf("sf2: reading chunk at %d: %w", off, err)
		}
		n := int64(binary.LittleEndian.Uint32(ch[4:8]))
		if string(ch[0:4]) == "LIST" && off+8+n <= end {
			switch string(ch[8:12]) {
			case "sdta":
				if err := f.findSmpl(off+12, off+8+n); err != nil {
					return nil, err
				}
			case "pdta":
				if n < 4 || n > 64<<20 {
					return nil, errors.New("sf2: pdta chunk size out of range")
				}
				pdta = make([]byte, n-4)
				if _, err := r.ReadAt(pdta, off+12); err != nil {
					return nil, fmt.Errorf("sf2: reading pdta: %w", err)
				}
			}
		}
		off += 8 + n + n&1
	}
	if pdta == nil || f.smplFrames == 0 {
		return nil, errors.New("sf2: missing sdta/smpl or pdta")
	}
	if err := f.parseHydra(pdta); err != nil {
		return nil, err
	}
	return f, nil
}

func (f *Font) findSmpl(off, end int64) error {
	for off+8 <= end {
		var ch [8]byte
		if _, err := f.r.ReadAt(ch[:], off); err != nil {
			return fmt.Errorf("sf2: reading sdta: %w", err)
		}
		n := int64(binary.LittleEndian.Uint32(ch[4:8]))
		if string(ch[0:4]) == "smpl" {
			f.smplOff, f.smplFrames = off+8, min(n, end-off-8)/2
			return nil
		}
		off += 8 + n + n&1
	}
	return errors.New("sf2: sdta has no smpl chunk")
}

// parseHydra reads shdr, inst, ibag and igen from the pdta sub-chunks.
func (f *Font) parseHydra(p []byte) error {
	sub := map[string][]byte{}
	for len(p) >= 8 {
		n := int(binary.LittleEndian.Uint32(p[4:8]))
		if n > len(p)-8 {
			return errors.New("sf2: truncated pdta sub-chunk")
		}
		sub[string(p[0:4])] = p[8 : 8+n]
		p = p[8+n:]
	}
	shdr := sub["shdr"]
	for i := 0; i+46 <= len(shdr); i += 46 {
		rec := shdr[i : i+46]
		s := Sample{
			Name:          name(rec[0:20]),
			Start:         binary.LittleEndian.Uint32(rec[20:]),
			End:           binary.LittleEndian.Uint32(rec[24:]),
			LoopStart:     binary.LittleEndian.Uint32(rec[28:]),
			LoopEnd:       binary.LittleEndian.Uint32(rec[32:]),
			Rate:          binary.LittleEndian.Uint32(rec[36:]),
			OriginalPitch: rec[40],
			Correction:    int8(rec[41]),
			Type:          binary.LittleEndian.Uint16(rec[44:]),
		}
		f.Samples = append(f.Samples, s)
	}
	if len(f.Samples) > 0 { // the terminal "EOS" record
		f.Samples = f.Samples[:len(f.Samples)-1]
	}
	inst, ibag, igen := sub["inst"], sub["ibag"], sub["igen"]
	const (
		sampleID = 53 // generator numbers, spec section 8.1.2
		rootKey  = 58
	)
	for i := 0; i+22+22 <= len(inst); i += 22 {
		in := Instrument{Name: name(inst[i : i+20])}
		b0 := int(binary.LittleEndian.Uint16(inst[i+20:]))
		b1 := int(binary.LittleEndian.Uint16(inst[i+42:]))
		for b := b0; b < b1 && 4*b+8 <= len(ibag); b++ {
			g0 := int(binary.LittleEndian.Uint16(ibag[4*b:]))
			g1 := int(binary.LittleEndian.Uint16(ibag[4*b+4:]))
			z := Zone{Sample: -1, RootKey: -1}
			for g := g0; g < g1 && 4*g+4 <= len(igen); g++ {
				amount := binary.LittleEndian.Uint16(igen[4*g+2:])
				switch binary.LittleEndian.Uint16(igen[4*g:]) {
				case sampleID:
					if int(amount) < len(f.Samples) {
						z.Sample = int(amount)
					}
				case rootKey:
					if amount < 128 {
						z.RootKey = int(amount)
					}
				}
			}
			if z.Sample >= 0 { // zones without a sample are global zones
				in.Zones = append(in.Zones, z)
			}
		}
		f.Instruments = append(f.Instruments, in)
	}
	return nil
}

func name(b []byte) string {
	if i := strings.IndexByte(string(b), 0); i >= 0 {
		b = b[:i]
	}
	return strings.TrimSpace(string(b))
}

// Frames reads sample frames [from, to) of the smpl chunk as values in
// [-1, 1).
func (f *Font) Frames(from, to uint32) ([]float64, error) {
	if from > to || int64(to) > f.smplFrames {
		return nil, fmt.Errorf("sf2: frames %d..%d outside the %d-frame sample chunk", from, to, f.smplFrames)
	}
	raw := make([]byte, 2*int(to-from))
	if _, err := f.r.ReadAt(raw, f.smplOff+2*int64(from)); err != nil {
		return nil, fmt.Errorf("sf2: reading samples: %w", err)
	}
	x := make([]float64, to-from)
	for i := range x {
		x[i] = float64(int16(binary.LittleEndian.Uint16(raw[2*i:]))) / 32768
	}
	return x, nil
}

// NominalHz is the pitch a zone says its sample has: the zone's overriding
// root key, else the sample's original key, less the sample's pitch
// correction (which is "applied on playback" to put it in tune, spec section
// 7.10), in equal temperament from A4 = 440 Hz at key 69 (MIDI 1.0, ISO 16).
func (f *Font) NominalHz(z Zone) float64 {
	s := f.Samples[z.Sample]
	key := float64(s.OriginalPitch)
	if z.RootKey >= 0 {
		key = float64(z.RootKey)
	}
	return 440 * math.Pow(2, (key-float64(s.Correction)/100-69)/12)
}

// LoopTruth is the exact fundamental of a loop played over and over: a loop
// of L frames at rate R holding k whole cycles repeats with period L/k, so
// its fundamental is k·R/L, with k the whole number of cycles nearest the
// nominal pitch. ok is false when the loop is missing, or when L·nominal/R
// is not within a tenth of a cycle of a whole number (k would be a guess).
func (s Sample) LoopTruth(nominal float64) (hz float64, cycles int, ok bool) {
	if s.LoopEnd <= s.LoopStart+8 || s.Rate == 0 || !(nominal > 0) {
		return 0, 0, false
	}
	l := float64(s.LoopEnd - s.LoopStart)
	exact := l * nominal / float64(s.Rate)
	k := math.Round(exact)
	if k < 1 || math.Abs(exact-k) > 0.1 {
		return 0, 0, false
	}
	return k * float64(s.Rate) / l, int(k), true
}
