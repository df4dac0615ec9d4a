// The output ring lives in C so that PortAudio's audio thread never enters
// the Go runtime (see capture/ring.h for why): a Go goroutine renders ahead
// into it, and the C callback only copies out.
#ifndef FIFTHLINE_OUTRING_H
#define FIFTHLINE_OUTRING_H

#include <stdint.h>
#include <portaudio.h>

typedef struct {
	float *buf;
	int64_t cap;        // samples, interleaved
	int64_t w, r;       // samples written and played; they only grow
	int64_t low;        // wake the writer when fewer than this wait
	int32_t channels;
	int32_t waiting;    // the writer sleeps on the pipe
	int32_t fd;         // the pipe's write end (non-blocking), or -1
	int32_t started;    // the writer has filled the ring once
	uint64_t underruns; // callbacks that found too little and played silence
} fl_out;

fl_out *fl_out_new(int64_t cap, int64_t low, int channels, int fd);
void fl_out_free(fl_out *q);
void fl_out_take(fl_out *q, float *out, unsigned long frames);
PaError fl_open_output(void **s, fl_out *q, int device, int channels,
	double latency, double rate, unsigned long frames, unsigned long flags);

#endif
