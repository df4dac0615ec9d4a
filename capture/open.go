package capture

import (
	"io"
	"path/filepath"
	"strings"
	"time"
)

// OpenRecording opens an audio file, whatever its name says, by what its
// first bytes are: WAV (RIFF, RF64, BW64), FLAC and MP3 are read here;
// anything else (M4A/AAC from a phone, Ogg, AIFF…) goes through ffmpeg when
// it is installed. channel is the one Read reads, counted from 1 (0 is the
// first).
func OpenRecording(path string, channel int) (*Recording, error) {
	f, size, err := openFile(path)
	if err != nil {
		return nil, err
	}
	if size == 0 {
		f.Close()
		return nil, fileErr(path, ErrNotAudio, "empty file")
	}
	kind, at := sniff(f)
	var rec *Recording
	switch kind {
	case "WAV":
		rec, err = newWAV(path, f, size, channel, time.Local)
	case "FLAC":
		rec, err = newFLAC(path, io.NewSectionReader(f, 0, size), channel)
	case "MP3":
		first := make([]byte, 512) // the first frame's header and LAME tag
		n, _ := f.ReadAt(first, at)
		rec, err = newMP3(path, io.NewSectionReader(f, 0, size), first[:n], channel)
	case journalKind:
		// Giving analyze the journal instead of the take is the likely slip,
		// as report names a WAV given it.
		f.Close()
		return nil, fileErr(path, ErrNotAudio, "it is a rehearsal journal, not a recording: read it with report")
	default:
		f.Close()
		return openFFmpeg(path, channel, kind)
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	rec.closer = f
	return rec, nil
}

// journalKind is what sniff calls a rehearsal journal (--log's CSV).
const journalKind = "journal"

// sniff names a file's format from its first bytes: "WAV", "FLAC", "MP3",
// a name for ffmpeg's message ("M4A/AAC", "Ogg"…), or "" when unknown, and
// where the format's first byte is (after an ID3 tag).
func sniff(r io.ReaderAt) (kind string, at int64) {
	var b [16]byte
	n, _ := r.ReadAt(b[:], 0)
	head := string(b[:n])
	// An ID3v2 tag (id3.org, ID3v2.4 §3.1) may precede MP3 and some FLAC:
	// "ID3", version 2 bytes, flags, a 28-bit size in four 7-bit bytes.
	if n >= 10 && head[:3] == "ID3" {
		at = 10 + (int64(b[6]&0x7f)<<21 | int64(b[7]&0x7f)<<14 | int64(b[8]&0x7f)<<7 | int64(b[9]&0x7f))
		if b[5]&0x10 != 0 { // a footer follows the tag
			at += 10
		}
		n, _ = r.ReadAt(b[:], at)
		head = string(b[:n])
	}
	switch {
	case n >= 12 && isRIFFForm(head[:4]) && head[8:12] == "WAVE", n >= 4 && head[:4] == "RIFX":
		return "WAV", at
	case n >= 4 && head[:4] == "fLaC":
		return "FLAC", at
	case n >= 4 && b[0] == 0xFF && b[1]&0xE0 == 0xE0 && b[1]&0x06 != 0:
		// An MPEG audio frame header (ISO/IEC 11172-3 §2.4.2.3): 11 sync
		// bits, version, layer (00 is reserved; AAC's ADTS uses it).
		return "MP3", at
	case n >= 4 && b[0] == 0xFF && b[1]&0xF6 == 0xF0:
		return "AAC", at
	case n >= 12 && head[4:8] == "ftyp":
		return "M4A/AAC", at
	case n >= 4 && head[:4] == "OggS":
		return "Ogg", at
	case n >= 12 && head[:4] == "FORM" && (head[8:12] == "AIFF" || head[8:12] == "AIFC"):
		return "AIFF", at
	case n >= 4 && head[:4] == "caff":
		return "CAF", at
	case strings.HasPrefix(head, "time,session,"):
		return journalKind, at // a --log journal's header (package journal)
	}
	return "", at
}

// formatByName guesses what a file of unknown content was meant to be from
// its extension, for the message when ffmpeg is missing; "" for the formats
// read here and names that are no known recording.
func formatByName(path string) string {
	return byExtension[strings.ToLower(filepath.Ext(path))]
}

var byExtension = map[string]string{
	".m4a": "M4A/AAC", ".mp4": "M4A/AAC", ".aac": "AAC", ".3gp": "3GP",
	".ogg": "Ogg", ".oga": "Ogg", ".opus": "Opus", ".aif": "AIFF", ".aiff": "AIFF",
	".caf": "CAF", ".wma": "WMA", ".wv": "WavPack", ".ape": "Monkey's Audio", ".amr": "AMR",
}
