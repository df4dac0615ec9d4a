// Package capture is the edge where sound enters fifthline: recordings read
// as a stream (WAV in its RIFF, RF64 and Broadcast Wave forms, FLAC and MP3
// decoded in Go, anything else through ffmpeg when it is installed), live
// input from PortAudio devices, and a paced synthetic performance for the
// demo. Every one of them is a Source that yields mono float32 blocks in
// [-1, 1] the way io.Reader yields bytes; a Recording is also a
// source.Multi, all its channels in step.
//
// It is not where pitch is found or notes are named (see pitchdetect and
// target): capture only delivers samples, counts what it lost, and reports
// bad files and vanished devices as one-line errors.
package capture
