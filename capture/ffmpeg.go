package capture

import (
	"bufio"
	"bytes"
	"cmp"
	"errors"
	"fmt"
	"io"
	"math"
	"os/exec"
	"strconv"
	"strings"
	"syscall"
)

// openFFmpeg reads a file fifthline has no decoder for through ffmpeg (the
// Debian package ffmpeg, with ffprobe): ffprobe says the rate, channels and
// length of the first audio stream (Frames is estimated from that length),
// and ffmpeg streams it as 32-bit float,
// which reads exactly as a float WAV does. kind is what the first bytes
// looked like ("M4A/AAC", or "" for unknown), for the message when ffmpeg
// is missing.
func openFFmpeg(path string, channel int, kind string) (*Recording, error) {
	if _, err := exec.LookPath("ffprobe"); err != nil {
		if kind = cmp.Or(kind, formatByName(path)); kind == "" {
			return nil, fileErr(path, ErrNotAudio, "not a WAV, FLAC or MP3 file, and ffmpeg, which reads most other formats, is not installed (Debian package ffmpeg)")
		}
		return nil, fileErr(path, ErrUnsupported, "%s needs ffmpeg, which is not installed (Debian package ffmpeg)", kind)
	}
	// "file:" keeps a name that starts with '-' or holds ':' a file name.
	in := "file:" + path
	out, err := exec.Command("ffprobe", "-v", "error", "-select_streams", "a:0",
		"-show_entries", "stream=codec_name,sample_rate,channels:format=duration",
		"-of", "default=noprint_wrappers=1", in).Output()
	if err != nil {
		return nil, fileErr(path, ErrNotAudio, "not a recording fifthline reads (ffprobe: %s)", strings.ReplaceAll(firstLine(exitText(err)), in, path))
	}
	p := probeFields(out)
	rate, _ := strconv.Atoi(p["sample_rate"])
	channels, _ := strconv.Atoi(p["channels"])
	seconds, _ := strconv.ParseFloat(p["duration"], 64)
	switch {
	case channels < 1 || p["codec_name"] == "":
		return nil, fileErr(path, ErrNotAudio, "no audio stream in the file (ffprobe)")
	case rate < minRate || rate > maxRate:
		return nil, fileErr(path, ErrUnsupported, "sample rate %d Hz is outside %d Hz to %d Hz", rate, minRate, maxRate)
	}
	cmd := exec.Command("ffmpeg", "-nostdin", "-v", "error", "-i", in, "-map", "0:a:0", "-f", "f32le", "-c:a", "pcm_f32le", "-")
	// Its own process group: Ctrl-C at the terminal is ours to handle (the
	// notes so far are kept), not a failure of ffmpeg's; Close ends it.
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	var stderr bytes.Buffer
	cmd.Stderr = &limited{w: &stderr, left: 4096}
	pipe, err := cmd.StdoutPipe()
	if err == nil {
		err = cmd.Start()
	}
	if err != nil {
		return nil, fileErr(path, err, "cannot start ffmpeg: %v", err)
	}
	proc := &ffmpegProcess{cmd: cmd, pipe: pipe, stderr: &stderr}
	frames := int64(-1)
	if seconds > 0 && !math.IsInf(seconds, 0) {
		frames = int64(math.Round(seconds * float64(rate)))
	}
	rec := &Recording{
		path: path, format: "ffmpeg (" + p["codec_name"] + ")", encoding: p["codec_name"],
		rate: rate, channels: channels, frames: frames, closer: proc,
		dec: &ffmpegDecoder{proc: proc, d: newInterleaved(pipe, channels, 4, sampleDecoder(tagFloat, 32))},
	}
	if err := rec.choose(channel); err != nil {
		proc.Close()
		return nil, err
	}
	return rec, nil
}

// probeFields reads ffprobe's key=value lines.
func probeFields(out []byte) map[string]string {
	m := map[string]string{}
	for _, line := range strings.Split(string(out), "\n") {
		if k, v, ok := strings.Cut(strings.TrimSpace(line), "="); ok && m[k] == "" {
			m[k] = v
		}
	}
	return m
}

// ffmpegProcess is a running ffmpeg whose output we read.
type ffmpegProcess struct {
	cmd    *exec.Cmd
	pipe   io.ReadCloser
	stderr *bytes.Buffer
	done   bool
	err    error
}

// wait reaps ffmpeg once and says why it failed, if it did.
func (p *ffmpegProcess) wait() error {
	if !p.done {
		p.done = true
		if err := p.cmd.Wait(); err != nil {
			p.err = fmt.Errorf("ffmpeg: %s", cmp.Or(firstLine(p.stderr.String()), err.Error()))
		}
	}
	return p.err
}

// Close stops ffmpeg if it is still decoding and reaps it.
func (p *ffmpegProcess) Close() error {
	if !p.done {
		p.pipe.Close()
		p.cmd.Process.Kill()
		p.cmd.Wait()
		p.done = true
	}
	return nil
}

// ffmpegDecoder reads ffmpeg's float samples; at their end, a failed
// ffmpeg is an error, not a short recording.
type ffmpegDecoder struct {
	proc *ffmpegProcess
	d    *interleaved
}

func (f *ffmpegDecoder) decode(dst [][]float32) (int, error) {
	n, err := f.d.decode(dst)
	if errors.Is(err, io.EOF) {
		if werr := f.proc.wait(); werr != nil {
			return n, werr
		}
	}
	return n, err
}

// limited keeps at most left bytes of what is written to it.
type limited struct {
	w    io.Writer
	left int
}

func (l *limited) Write(b []byte) (int, error) {
	if k := min(len(b), l.left); k > 0 {
		l.w.Write(b[:k])
		l.left -= k
	}
	return len(b), nil
}

// exitText is what a failed command printed, else the error.
func exitText(err error) string {
	var ee *exec.ExitError
	if errors.As(err, &ee) && len(ee.Stderr) > 0 {
		return string(ee.Stderr)
	}
	return err.Error()
}

// firstLine is the first non-empty line of msg, for one-line errors.
func firstLine(msg string) string {
	sc := bufio.NewScanner(strings.NewReader(msg))
	for sc.Scan() {
		if line := strings.TrimSpace(sc.Text()); line != "" {
			return line
		}
	}
	return strings.TrimSpace(msg)
}
