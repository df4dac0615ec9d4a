#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include "ring.h"

fl_out *fl_out_new(int64_t cap, int64_t low, int channels, int fd) {
	fl_out *q = calloc(1, sizeof *q);
	if (!q) return NULL;
	q->buf = calloc((size_t)cap, sizeof(float));
	if (!q->buf) {
		free(q);
		return NULL;
	}
	q->cap = cap;
	q->low = low;
	q->channels = channels;
	q->fd = fd;
	return q;
}

void fl_out_free(fl_out *q) {
	if (q) free(q->buf);
	free(q);
}

// fl_out_take is the callback's work: the next frames from the ring, and
// silence for whatever the writer has not rendered yet.
void fl_out_take(fl_out *q, float *out, unsigned long frames) {
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
	if (w - r - n < q->low && q->fd >= 0 && __atomic_exchange_n(&q->waiting, 0, __ATOMIC_SEQ_CST)) {
		char c = 1;
		(void)!write(q->fd, &c, 1);
	}
}

static int callback(const void *in, void *out, unsigned long frames,
	const PaStreamCallbackTimeInfo *t, PaStreamCallbackFlags flags, void *user) {
	(void)in;
	(void)t;
	(void)flags;
	fl_out_take(user, out, frames);
	return paContinue;
}

PaError fl_open_output(void **s, fl_out *q, int device, int channels,
	double latency, double rate, unsigned long frames, unsigned long flags) {
	PaStreamParameters p;
	memset(&p, 0, sizeof p);
	p.device = device;
	p.channelCount = channels;
	p.sampleFormat = paFloat32;
	p.suggestedLatency = latency;
	return Pa_OpenStream((PaStream **)s, NULL, &p, rate, frames, flags, callback, q);
}
