// The audio rings live in C so that PortAudio's audio thread never enters
// the Go runtime: a Go callback would leave a scheduler slot parked in a
// system call between blocks, which keeps Go's monitor thread waking every
// few microseconds (measured: a quarter of the live path's CPU). One ring
// serves both directions: the input's callback writes it and a goroutine
// reads; the output's callback reads it and a goroutine writes.
#ifndef FIFTHLINE_RING_H
#define FIFTHLINE_RING_H

#include <stdint.h>
#include <portaudio.h>

// The most channels one input ring carries.
enum { FL_MAX_KEEP = 64 };

// Go reads the 64-bit counters with sync/atomic, which needs them 8-byte
// aligned even where C would align them to 4 (32-bit x86): hence fl_a64.
#define fl_a64 __attribute__((aligned(8)))

typedef struct {
	float *buf;
	fl_a64 int64_t cap;      // samples, a whole number of frames
	fl_a64 int64_t w, r;     // samples written and read; they only grow
	int32_t waiting;         // the goroutine is about to sleep on the pipe
	int32_t fd;              // the pipe's write end (non-blocking), or -1
	int32_t channels;        // interleaved channels in a callback's buffer
	// Input: keep channels pick[0..keep) of each frame, interleaved in
	// that order; count clipping and what came.
	int32_t keep;
	int32_t pick[FL_MAX_KEEP];
	uint32_t peak_bits;      // largest magnitude so far, as float bits
	float clip;              // magnitude counted as clipping
	fl_a64 uint64_t blocks, overflows, dropped, dropped_samples, clipped;
	fl_a64 int64_t last_ns;  // CLOCK_REALTIME of the last callback
	// The latest callback's first frame (counted in frames kept) and when
	// it reached the converter on PortAudio's stream clock
	// (inputBufferAdcTime), under a sequence count that is odd while they
	// change and 0 before the first.
	fl_a64 int64_t anchor_frame;
	double anchor_adc;
	uint32_t anchor_seq;
	// Output: wake the writer when fewer than low samples wait; count
	// callbacks that found too little once it has filled the ring.
	fl_a64 int64_t low;
	int32_t started;
	fl_a64 uint64_t underruns;
} fl_ring;

fl_ring *fl_ring_new(int64_t cap, int channels, int fd);
void fl_ring_free(fl_ring *q);
int fl_ring_write(fl_ring *q, const float *p, int64_t n);
void fl_ring_deliver(fl_ring *q, const float *in, unsigned long frames, int overflow);
void fl_ring_time(fl_ring *q, double adc);
int fl_ring_anchor(fl_ring *q, int64_t *frame, double *adc);
void fl_ring_take(fl_ring *q, float *out, unsigned long frames);
PaError fl_open(PaStream **s, fl_ring *q, int input, int device, int channels,
	double latency, double rate, unsigned long frames, unsigned long flags);

#endif
