package main

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"os/exec"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"time"

	"fifthline/pitchdetect"
)

// track is a detector's frame track: times (window centres, seconds) and
// pitches (0 when unvoiced).
type track struct {
	t, hz []float64
}

// result is what one detector made of one clip.
type result struct {
	track
	held      []pitchdetect.Held // fifthline only
	firstRead float64            // seconds from onset to first reading; NaN if none
	cpu       time.Duration
}

// runFifthline feeds a clip hop by hop, as the live meter does, and times
// the detector (not the Segmenter) on its own thread.
func runFifthline(c clip) (result, error) {
	d, err := pitchdetect.New(c.rate, 0, 0)
	if err != nil {
		return result{}, err
	}
	seg := d.NewSegmenter()
	res := result{firstRead: math.NaN()}
	res.t = make([]float64, 0, len(c.x)/d.Hop()+1)
	res.hz = make([]float64, 0, len(c.x)/d.Hop()+1)
	out := make([]pitchdetect.Estimate, 0, 4)
	runtime.LockOSThread()
	defer runtime.UnlockOSThread()
	for i := 0; i < len(c.x); i += d.Hop() {
		t0 := threadCPU()
		out = d.Feed(c.x[i:min(i+d.Hop(), len(c.x))], out[:0])
		res.cpu += threadCPU() - t0
		for _, e := range out {
			res.t = append(res.t, e.Time)
			res.hz = append(res.hz, e.Hz)
			if h, ok := seg.Push(e); ok {
				res.held = append(res.held, h)
			}
			if h, ok := seg.Current(); ok && math.IsNaN(res.firstRead) && c.kind == onset &&
				math.Abs(cents(h.Hz, c.hz)) < 50 {
				res.firstRead = float64(min(i+d.Hop(), len(c.x)))/c.rate - c.start
			}
		}
	}
	if h, ok := seg.Flush(); ok {
		res.held = append(res.held, h)
	}
	return res, nil
}

// threadCPU is the calling thread's user+system CPU time (Linux
// RUSAGE_THREAD).
func threadCPU() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(1, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// runAubio runs aubiopitch with the same buffer and hop as fifthline's
// window and hop at the clip's rate, and times the child process.
func runAubio(aubio, method string, c clip) (result, error) {
	d, _ := pitchdetect.New(c.rate, 0, 0)
	buf, hop := d.Window(), d.Hop()
	cmd := exec.Command(aubio, "-i", c.path, "-p", method, "-B", strconv.Itoa(buf), "-H", strconv.Itoa(hop))
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		return result{}, fmt.Errorf("aubiopitch -p %s %s: %v: %s", method, c.name, err, strings.TrimSpace(stderr.String()))
	}
	res := result{firstRead: math.NaN(), cpu: cmd.ProcessState.UserTime() + cmd.ProcessState.SystemTime()}
	sc := bufio.NewScanner(&stdout)
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) != 2 {
			continue
		}
		t, err1 := strconv.ParseFloat(f[0], 64)
		hz, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil {
			continue
		}
		// aubio prints the start of hop i; its buffer then ends at
		// (i+1)·hop, so its centre is half a buffer earlier.
		end := t + float64(hop)/c.rate
		if hz < 0 || math.IsNaN(hz) {
			hz = 0
		}
		res.t = append(res.t, end-float64(buf)/(2*c.rate))
		res.hz = append(res.hz, hz)
		if c.kind == onset && math.IsNaN(res.firstRead) && end > c.start && hz > 0 && math.Abs(cents(hz, c.hz)) < 50 {
			res.firstRead = end - c.start
		}
	}
	return res, nil
}

func cents(a, b float64) float64 { return 1200 * math.Log2(a/b) }
