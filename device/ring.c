#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>
#include "ring.h"

// Block is the most a callback delivers at once: each block is written
// whole or dropped whole, never torn.
enum { block = 512 };

fl_ring *fl_ring_new(int64_t cap, int channels, int fd) {
	fl_ring *q = calloc(1, sizeof *q);
	if (!q) return NULL;
	q->buf = calloc((size_t)cap, sizeof(float));
	if (!q->buf) {
		free(q);
		return NULL;
	}
	q->cap = cap;
	q->channels = channels;
	q->keep = channels; // every channel, until told otherwise
	for (int k = 0; k < channels && k < FL_MAX_KEEP; k++) q->pick[k] = k;
	q->fd = fd;
	return q;
}

void fl_ring_free(fl_ring *q) {
	if (q) free(q->buf);
	free(q);
}

// wake tells the goroutine, if it is waiting (and only then), that there
// are samples to read or room to write.
static void wake(fl_ring *q) {
	if (q->fd >= 0 && __atomic_exchange_n(&q->waiting, 0, __ATOMIC_SEQ_CST)) {
		char c = 1;
		(void)!write(q->fd, &c, 1); // a full pipe already holds a wake-up
	}
}

// room says whether n more samples fit, and where the writer stands.
static int room(fl_ring *q, int64_t n, int64_t *w) {
	*w = __atomic_load_n(&q->w, __ATOMIC_RELAXED);
	int64_t r = __atomic_load_n(&q->r, __ATOMIC_ACQUIRE);
	return q->cap - (*w - r) >= n;
}

// put stores the picked channels of n frames of in (q->channels
// interleaved), or nothing if there is not room for all of them.
static int put(fl_ring *q, const float *in, int64_t n) {
	int64_t w, keep = q->keep;
	if (!room(q, n * keep, &w)) return 0;
	int64_t at = w % q->cap; // cap is whole frames: a frame never wraps
	for (int64_t i = 0; i < n; i++, in += q->channels) {
		for (int64_t k = 0; k < keep; k++) q->buf[at + k] = in[q->pick[k]];
		if ((at += keep) == q->cap) at = 0;
	}
	__atomic_store_n(&q->w, w + n * keep, __ATOMIC_SEQ_CST);
	return 1;
}

int fl_ring_write(fl_ring *q, const float *p, int64_t n) {
	int64_t w;
	if (!room(q, n, &w)) return 0;
	for (int64_t i = 0; i < n; i++) q->buf[(w + i) % q->cap] = p[i];
	__atomic_store_n(&q->w, w + n, __ATOMIC_SEQ_CST);
	wake(q);
	return 1;
}

void fl_ring_deliver(fl_ring *q, const float *in, unsigned long frames, int overflow) {
	struct timespec ts;
	clock_gettime(CLOCK_REALTIME, &ts);
	__atomic_store_n(&q->last_ns, (int64_t)ts.tv_sec * 1000000000 + ts.tv_nsec, __ATOMIC_RELAXED);
	__atomic_add_fetch(&q->blocks, 1, __ATOMIC_RELAXED);
	if (overflow) __atomic_add_fetch(&q->overflows, 1, __ATOMIC_RELAXED);
	if (!in) return;
	float peak = 0;
	uint64_t clipped = 0;
	for (unsigned long start = 0; start < frames; start += block) {
		int64_t n = frames - start < block ? frames - start : block;
		const float *x = in + start * q->channels;
		for (int64_t i = 0; i < n; i++) {
			for (int k = 0; k < q->keep; k++) {
				float a = x[i * q->channels + q->pick[k]];
				a = a < 0 ? -a : a;
				if (a > peak) peak = a;
				if (a >= q->clip) clipped++;
			}
		}
		if (!put(q, x, n)) {
			__atomic_add_fetch(&q->dropped, 1, __ATOMIC_RELAXED);
			__atomic_add_fetch(&q->dropped_samples, (uint64_t)n, __ATOMIC_RELAXED);
		}
	}
	if (clipped) __atomic_add_fetch(&q->clipped, clipped, __ATOMIC_RELAXED);
	uint32_t bits;
	memcpy(&bits, &peak, sizeof bits);
	float old;
	uint32_t oldBits = __atomic_load_n(&q->peak_bits, __ATOMIC_RELAXED);
	memcpy(&old, &oldBits, sizeof old);
	if (peak > old) __atomic_store_n(&q->peak_bits, bits, __ATOMIC_RELAXED); // only this thread writes
	wake(q);
}

// fl_ring_take is the output callback's work: the next frames from the
// ring, and silence for whatever the writer has not rendered yet.
void fl_ring_take(fl_ring *q, float *out, unsigned long frames) {
	int64_t need = (int64_t)frames * q->channels;
	int64_t r = __atomic_load_n(&q->r, __ATOMIC_RELAXED);
	int64_t w = __atomic_load_n(&q->w, __ATOMIC_ACQUIRE);
	int64_t n = w - r < need ? w - r : need;
	for (int64_t i = 0; i < n; i++) out[i] = q->buf[(r + i) % q->cap];
	if (n < need) {
		memset(out + n, 0, (size_t)(need - n) * sizeof(float));
		if (__atomic_load_n(&q->started, __ATOMIC_RELAXED))
			__atomic_add_fetch(&q->underruns, 1, __ATOMIC_RELAXED);
	}
	__atomic_store_n(&q->r, r + n, __ATOMIC_SEQ_CST);
	if (w - r - n < __atomic_load_n(&q->low, __ATOMIC_RELAXED)) wake(q);
}

// fl_ring_time notes, before a callback's block is delivered, when its
// first frame reached the converter. Every block is noted, not only the
// first: through the ALSA pulse plugin the first second's times run
// 0.6 s early, then settle (measured).
void fl_ring_time(fl_ring *q, double adc) {
	int64_t frame = __atomic_load_n(&q->w, __ATOMIC_RELAXED) / q->keep;
	uint32_t seq = __atomic_load_n(&q->anchor_seq, __ATOMIC_RELAXED);
	__atomic_store_n(&q->anchor_seq, seq + 1, __ATOMIC_RELAXED);
	__atomic_thread_fence(__ATOMIC_RELEASE);
	__atomic_store_n(&q->anchor_frame, frame, __ATOMIC_RELAXED);
	__atomic_store(&q->anchor_adc, &adc, __ATOMIC_RELAXED);
	__atomic_store_n(&q->anchor_seq, seq + 2, __ATOMIC_RELEASE);
}

// fl_ring_anchor reads the latest block's frame and time, consistent with
// each other; 0 before the first block.
int fl_ring_anchor(fl_ring *q, int64_t *frame, double *adc) {
	for (;;) {
		uint32_t seq = __atomic_load_n(&q->anchor_seq, __ATOMIC_ACQUIRE);
		if (seq == 0) return 0;
		if (seq & 1) continue; // the audio thread is writing them
		*frame = __atomic_load_n(&q->anchor_frame, __ATOMIC_RELAXED);
		__atomic_load(&q->anchor_adc, adc, __ATOMIC_RELAXED);
		__atomic_thread_fence(__ATOMIC_ACQUIRE);
		if (__atomic_load_n(&q->anchor_seq, __ATOMIC_RELAXED) == seq) return 1;
	}
}

static int input_callback(const void *in, void *out, unsigned long frames,
	const PaStreamCallbackTimeInfo *t, PaStreamCallbackFlags flags, void *user) {
	(void)out;
	if (in && frames) fl_ring_time(user, t->inputBufferAdcTime);
	fl_ring_deliver(user, in, frames, (flags & paInputOverflow) != 0);
	return paContinue;
}

static int output_callback(const void *in, void *out, unsigned long frames,
	const PaStreamCallbackTimeInfo *t, PaStreamCallbackFlags flags, void *user) {
	(void)in;
	(void)t;
	(void)flags;
	fl_ring_take(user, out, frames);
	return paContinue;
}

// fl_open opens a stream on device whose callback is this file's: an input
// delivering into q, or an output taking from it.
PaError fl_open(PaStream **s, fl_ring *q, int input, int device, int channels,
	double latency, double rate, unsigned long frames, unsigned long flags) {
	PaStreamParameters p;
	memset(&p, 0, sizeof p);
	p.device = device;
	p.channelCount = channels;
	p.sampleFormat = paFloat32;
	p.suggestedLatency = latency;
	if (input) return Pa_OpenStream(s, &p, NULL, rate, frames, flags, input_callback, q);
	return Pa_OpenStream(s, NULL, &p, rate, frames, flags, output_callback, q);
}
