// Package voiceframes keeps one microphone's voices' frames, as the group
// meter is handed them, in a small CSV file, so that the tests of cmd and
// of ui read one recorded scene without rendering it again. It is for test
// fixtures only: nothing the program writes or reads for a user.
//
// A line is a frame: its time and span (seconds), then for each voice its
// pitch (Hz), level (dBFS) and marks: m, marked on a lower voice's
// partials in this frame; p, taken for them by the voices' note tracker.
package voiceframes

import (
	"cmp"
	"encoding/csv"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
)

// Frame is one line of the file; its voices' values stand at one index in
// each slice.
type Frame struct {
	At, Span float64 // seconds
	Hz, DB   []float64
	Marked   []bool // marked on a lower voice's partials in this frame
	Partials []bool // and taken for them by the voices' note tracker
}

// Format writes frames, rounded as the fixtures keep them (a tenth of a
// millisecond, a thousandth of a hertz, a hundredth of a decibel).
func Format(w io.Writer, frames []Frame) error {
	cw := csv.NewWriter(w)
	for _, fr := range frames {
		rec := []string{strconv.FormatFloat(fr.At, 'f', 4, 64), strconv.FormatFloat(fr.Span, 'f', 4, 64)}
		for v := range fr.Hz {
			marks := ""
			if fr.Marked[v] {
				marks = "m"
			}
			if fr.Partials[v] {
				marks += "p"
			}
			rec = append(rec, strconv.FormatFloat(fr.Hz[v], 'f', 3, 64), strconv.FormatFloat(fr.DB[v], 'f', 2, 64), marks)
		}
		cw.Write(rec)
	}
	cw.Flush()
	return cw.Error()
}

// Write writes frames to the file at path.
func Write(path string, frames []Frame) error {
	f, err := os.Create(path)
	if err != nil {
		return err
	}
	return cmp.Or(Format(f, frames), f.Close())
}

// Parse reads frames as Format writes them.
func Parse(r io.Reader) ([]Frame, error) {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = -1
	var frames []Frame
	for line := 1; ; line++ {
		rec, err := cr.Read()
		if err == io.EOF {
			return frames, nil
		}
		if err != nil {
			return nil, err
		}
		if len(rec) < 2 || (len(rec)-2)%3 != 0 {
			return nil, fmt.Errorf("line %d: %d fields, want a time, a span and three a voice", line, len(rec))
		}
		nums := make([]float64, len(rec))
		for i, s := range rec {
			if (i-2)%3 == 2 {
				continue // marks
			}
			if nums[i], err = strconv.ParseFloat(s, 64); err != nil {
				return nil, fmt.Errorf("line %d: %v", line, err)
			}
		}
		fr := Frame{At: nums[0], Span: nums[1]}
		for v := 2; v < len(rec); v += 3 {
			fr.Hz, fr.DB = append(fr.Hz, nums[v]), append(fr.DB, nums[v+1])
			fr.Marked, fr.Partials = append(fr.Marked, strings.Contains(rec[v+2], "m")), append(fr.Partials, strings.Contains(rec[v+2], "p"))
		}
		frames = append(frames, fr)
	}
}

// Read reads the file at path; its errors name the file.
func Read(path string) ([]Frame, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	frames, err := Parse(f)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return frames, nil
}
