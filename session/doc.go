// Package session runs the listening pipeline: samples from a source.Source
// go through a pitchdetect.Detector and Segmenter, and each frame and each
// held note is read in the current target.Tuning and handed to the sinks (the
// meter, the journal, line output).
//
// It is the one loop shared by live listening, the demo and file analysis, so
// that all three hear alike. It owns no screen and no files; sinks do.
package session
