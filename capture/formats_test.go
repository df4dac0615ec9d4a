package capture

import (
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// ffmpeg is the second reference tool (Debian package ffmpeg): it writes
// the forms of WAV sox does not (RF64, bext) and the lossy formats.
func ffmpeg(t testing.TB, args ...string) {
	t.Helper()
	if _, err := exec.LookPath("ffmpeg"); err != nil {
		t.Skip("ffmpeg not installed (Debian package ffmpeg; scripts/install-deps installs it)")
	}
	cmd := exec.Command("ffmpeg", append([]string{"-nostdin", "-v", "error", "-y"}, args...)...)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("ffmpeg %s: %v %s", strings.Join(args, " "), err, out)
	}
}

// readChannels drains a Recording through ReadChannels, in blocks.
func readChannels(t testing.TB, r *Recording, block int) [][]float32 {
	t.Helper()
	all := make([][]float32, r.Channels())
	dst := make([][]float32, r.Channels())
	for c := range dst {
		dst[c] = make([]float32, block)
	}
	for {
		n, err := r.ReadChannels(dst)
		for c := range dst {
			all[c] = append(all[c], dst[c][:n]...)
		}
		if errors.Is(err, io.EOF) {
			return all
		}
		if err != nil {
			t.Fatalf("ReadChannels: %v", err)
		}
	}
}

// Every lossless form of one multichannel take — the WAV sox wrote, FLAC
// (sox), RF64 (ffmpeg, EBU Tech 3306's ds64), float, and AIFF (sox; read
// through ffmpeg) — reads through OpenRecording, by content, to exactly the
// samples sox decodes from the original, every channel in step.
func TestLosslessFormatsReadAsTheOriginal(t *testing.T) {
	dir := t.TempDir()
	orig := soxFile(t, dir, "take.wav", []string{"-r", "48000", "-b", "24", "-c", "3"}, "0.4", "sine", "220", "sine", "330", "square", "440")
	conv := func(name string, args ...string) string {
		path := filepath.Join(dir, name)
		ffmpeg(t, append(append([]string{"-i", orig}, args...), path)...)
		return path
	}
	flac := filepath.Join(dir, "take.flac")
	sox(t, orig, flac)
	misnamed := filepath.Join(dir, "flac-named.wav")
	sox(t, orig, "-t", "flac", misnamed)
	aiff := filepath.Join(dir, "take.aiff") // read through ffmpeg
	sox(t, orig, aiff)
	cases := []struct{ path, format, encoding string }{
		{orig, "WAV", "24-bit PCM"},
		{flac, "FLAC", "24-bit FLAC"},
		{misnamed, "FLAC", "24-bit FLAC"},
		{conv("rf64.wav", "-c:a", "pcm_s24le", "-rf64", "always"), "RF64", "24-bit PCM"},
		{conv("f32.wav", "-c:a", "pcm_f32le"), "WAV", "32-bit float"},
		{aiff, "ffmpeg (pcm_s24be)", "pcm_s24be"},
	}
	want := [][]float32{soxSamples(t, orig, 1), soxSamples(t, orig, 2), soxSamples(t, orig, 3)}
	for _, c := range cases {
		t.Run(filepath.Base(c.path), func(t *testing.T) {
			r, err := OpenRecording(c.path, 0)
			if err != nil {
				t.Fatal(err)
			}
			defer r.Close()
			if r.Format() != c.format || r.Encoding() != c.encoding || r.Channels() != 3 || r.SampleRate() != 48000 || r.Frames() != 19200 {
				t.Errorf("%s %s, %d channels at %v Hz, %d frames; want %s %s, 3 at 48000, 19200 (sox synth 0.4 at 48 kHz)",
					r.Format(), r.Encoding(), r.Channels(), r.SampleRate(), r.Frames(), c.format, c.encoding)
			}
			got := readChannels(t, r, 1000)
			for ch := range want {
				if len(got[ch]) != len(want[ch]) || maxDiff(got[ch], want[ch]) > 1e-7 {
					t.Errorf("channel %d: %d samples differing from sox by %g", ch+1, len(got[ch]), maxDiff(got[ch], want[ch]))
				}
			}
		})
	}
}

// MP3 (LAME through ffmpeg) and AAC in an M4A (ffmpeg's encoder, as phones
// write) read with their rate, their channels and about their length; the
// analysis tests in cmd/fifthline compare their readings with the WAV's.
func TestLossyFormatsOpen(t *testing.T) {
	dir := t.TempDir()
	mono := soxFile(t, dir, "mono.wav", []string{"-r", "44100", "-b", "16"}, "1", "sine", "440")
	stereo := soxFile(t, dir, "stereo.wav", []string{"-r", "48000", "-b", "16", "-c", "2"}, "1", "sine", "440", "sine", "660")
	cases := []struct {
		name, from       string
		args             []string
		format, encoding string
		channels         int
		rate             float64
	}{
		{"mono.mp3", mono, []string{"-c:a", "libmp3lame", "-b:a", "192k"}, "MP3", "MP3", 1, 44100},
		{"stereo.mp3", stereo, []string{"-c:a", "libmp3lame", "-b:a", "192k"}, "MP3", "MP3", 2, 48000},
		{"tagged.mp3", mono, []string{"-c:a", "libmp3lame", "-metadata", "title=Sarabande, take 3", "-id3v2_version", "4"}, "MP3", "MP3", 1, 44100},
		{"phone.m4a", stereo, []string{"-c:a", "aac", "-b:a", "128k"}, "ffmpeg (aac)", "aac", 2, 48000},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path := filepath.Join(dir, c.name)
			ffmpeg(t, append(append([]string{"-i", c.from}, c.args...), path)...)
			r, err := OpenRecording(path, c.channels)
			if err != nil {
				t.Fatal(err)
			}
			defer r.Close()
			if r.Format() != c.format || r.Encoding() != c.encoding || r.Channels() != c.channels || r.SampleRate() != c.rate {
				t.Errorf("%s %s, %d channels at %v Hz; want %s %s, %d at %v", r.Format(), r.Encoding(), r.Channels(), r.SampleRate(), c.format, c.encoding, c.channels, c.rate)
			}
			// Encoders add a delay and pad to whole frames (1152 samples
			// for MP3, 1024 for AAC): the length grows by at most ~0.1 s.
			n := len(readAll(t, r, 4096))
			if secs := float64(n) / c.rate; secs < 1 || secs > 1.1 || (r.Frames() > 0 && abs64(r.Frames()-int64(n)) > 2048) {
				t.Errorf("%d samples (%.3f s), Frames says %d; want 1 s to 1.1 s (sox synth 1)", n, secs, r.Frames())
			}
		})
	}
}

func abs64(v int64) int64 { return max(v, -v) }

// Without ffmpeg, a phone recording is one line naming what is missing; a
// file that is nothing known says what fifthline reads.
func TestWithoutFFmpegTheMessageNamesIt(t *testing.T) {
	dir := t.TempDir()
	m4a := filepath.Join(dir, "phone.m4a")
	// The first bytes of an MP4 file: a box size, then "ftyp" and a brand
	// (ISO/IEC 14496-12 §4.3).
	os.WriteFile(m4a, []byte("\x00\x00\x00\x20ftypM4A \x00\x00\x00\x00M4A mp42isom\x00\x00\x00\x00"), 0o644)
	text := filepath.Join(dir, "notes")
	os.WriteFile(text, []byte("rosin, strings, a pencil\n"), 0o644)
	t.Setenv("PATH", dir) // no ffmpeg or ffprobe here
	for path, want := range map[string]string{
		m4a:  m4a + ": M4A/AAC needs ffmpeg, which is not installed (Debian package ffmpeg)",
		text: text + ": not a WAV, FLAC or MP3 file, and ffmpeg, which reads most other formats, is not installed (Debian package ffmpeg)",
	} {
		if r, err := OpenRecording(path, 1); err == nil || err.Error() != want {
			if r != nil {
				r.Close()
			}
			t.Errorf("got %v\nwant %s", err, want)
		}
	}
}

// With ffmpeg, a file that is no recording is still one line.
func TestFFmpegRefusesWhatIsNotSound(t *testing.T) {
	if _, err := exec.LookPath("ffprobe"); err != nil {
		t.Skip("ffmpeg not installed")
	}
	path := filepath.Join(t.TempDir(), "notes.txt")
	os.WriteFile(path, []byte("rosin, strings, a pencil\n"), 0o644)
	_, err := OpenRecording(path, 1)
	if err == nil || !errors.Is(err, ErrNotAudio) || strings.Count(err.Error(), "\n") > 0 || !strings.HasPrefix(err.Error(), path+": not a recording fifthline reads (ffprobe: ") {
		t.Errorf("got %v", err)
	}
}

// A rehearsal journal given to analyze instead of the take is named, with
// the command that reads it (as report names a WAV given it).
func TestAJournalIsNoRecording(t *testing.T) {
	path := filepath.Join(t.TempDir(), "rehearsal.csv")
	os.WriteFile(path, []byte("time,session,source,player,key\n"), 0o644)
	_, err := OpenRecording(path, 1)
	if err == nil || !errors.Is(err, ErrNotAudio) || err.Error() != path+": it is a rehearsal journal, not a recording: read it with report" {
		t.Errorf("got %v", err)
	}
}

// Our MP3 reading lines up with ffmpeg's decoding of the same file (which
// drops the codec's delay and padding from the LAME tag): the same number
// of samples, starting at the same one, differing only by the 16-bit
// output of the pure-Go decoder.
func TestMP3LinesUpWithFFmpeg(t *testing.T) {
	dir := t.TempDir()
	orig := soxFile(t, dir, "sweep.wav", []string{"-r", "44100", "-b", "16"}, "1", "sine", "440", "sine", "0:2000")
	for _, rate := range []string{"128k", "320k"} {
		mp3, ref := filepath.Join(dir, rate+".mp3"), filepath.Join(dir, rate+".wav")
		ffmpeg(t, "-i", orig, "-c:a", "libmp3lame", "-b:a", rate, mp3)
		ffmpeg(t, "-i", mp3, "-c:a", "pcm_f32le", ref)
		r, err := OpenRecording(mp3, 1)
		if err != nil {
			t.Fatal(err)
		}
		got, want := readAll(t, r, 4096), soxSamples(t, ref, 1)
		r.Close()
		// 2^-15 is one step of the 16-bit output; the decoders' arithmetic
		// differs by a few.
		if len(got) != len(want) || len(got) != 44100 || maxDiff(got, want) > 8.0/(1<<15) {
			t.Errorf("%s: %d samples (ffmpeg %d, sox synth 1 at 44.1 kHz 44100), differing by %g", rate, len(got), len(want), maxDiff(got, want))
		}
	}
}

// ReadChannels refuses slices that do not fit the recording, in one line.
func TestReadChannelsChecksItsSlices(t *testing.T) {
	path := soxFile(t, t.TempDir(), "duo.wav", []string{"-r", "8000", "-b", "16", "-c", "2"}, "0.1", "sine", "440", "sine", "660")
	r, err := OpenRecording(path, 1)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	for _, dst := range [][][]float32{{make([]float32, 8)}, {make([]float32, 8), make([]float32, 4)}} {
		if _, err := r.ReadChannels(dst); err == nil || strings.Contains(err.Error(), "\n") {
			t.Errorf("ReadChannels(%d slices) = %v, want a one-line error", len(dst), err)
		}
	}
	if n, err := r.ReadChannels([][]float32{nil, nil}); n != 0 || err != nil {
		t.Errorf("empty slices: %d, %v; want 0, nil", n, err)
	}
}

// A FLAC or MP3 file cut short (a recorder that lost power, a copy that
// stopped) yields the samples it holds, the same as the whole file's
// first ones, and says it was cut, as a truncated WAV does.
func TestCutFLACAndMP3ReadWhatIsThere(t *testing.T) {
	dir := t.TempDir()
	orig := soxFile(t, dir, "take.wav", []string{"-r", "48000", "-b", "16"}, "2", "sine", "440")
	whole := map[string]string{"take.flac": filepath.Join(dir, "take.flac"), "take.mp3": filepath.Join(dir, "take.mp3")}
	sox(t, orig, whole["take.flac"])
	ffmpeg(t, "-i", orig, "-c:a", "libmp3lame", "-b:a", "128k", whole["take.mp3"])
	for name, path := range whole {
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		cut := filepath.Join(dir, "cut-"+name)
		os.WriteFile(cut, b[:len(b)/2], 0o644)
		full, err := OpenRecording(path, 1)
		if err != nil {
			t.Fatal(err)
		}
		want := readAll(t, full, 4096)
		full.Close()
		r, err := OpenRecording(cut, 1)
		if err != nil {
			t.Fatal(err)
		}
		got := readAll(t, r, 4096)
		r.Close()
		if !r.Truncated() || full.Truncated() || len(got) < len(want)/3 || len(got) >= len(want) || maxDiff(got, want[:len(got)]) > 0 {
			t.Errorf("%s cut in half: %d of %d samples, Truncated %v (whole: %v)", name, len(got), len(want), r.Truncated(), full.Truncated())
		}
	}
}
