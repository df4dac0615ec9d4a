// The input ring lives in C so that PortAudio's audio thread never enters
// the Go runtime: a Go callback would leave a scheduler slot parked in a
// system call between blocks, which keeps Go's monitor thread waking every
// few microseconds (measured: a third of the live path's CPU).
#ifndef FIFTHLINE_RING_H
#define FIFTHLINE_RING_H

#include <stdint.h>
#include <portaudio.h>

typedef struct {
	float *buf;
	int64_t cap;
	int64_t w, r;        // samples written and read; they only grow
	int32_t waiting;     // the reader is about to sleep on the pipe
	int32_t channels;    // interleaved channels in a callback's buffer
	int32_t channel;     // the one kept, from 0
	int32_t fd;          // the pipe's write end (non-blocking), or -1
	uint32_t peak_bits;  // largest magnitude so far, as float bits
	float clip;          // magnitude counted as clipping
	uint64_t blocks, overflows, dropped, dropped_samples, clipped;
	int64_t last_ns;     // CLOCK_REALTIME of the last callback
} fl_ring;

fl_ring *fl_ring_new(int64_t cap, int channels, int channel, int fd, float clip);
void fl_ring_free(fl_ring *q);
int fl_ring_write(fl_ring *q, const float *p, int64_t n);
void fl_ring_deliver(fl_ring *q, const float *in, unsigned long frames, int overflow);
PaError fl_open_input(PaStream **s, fl_ring *q, int device, int channels,
	double latency, double rate, unsigned long frames, unsigned long flags);

#endif
