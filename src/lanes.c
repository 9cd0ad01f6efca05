/* acidlot: ordered work in two threads.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "lanes.h"

#include <pthread.h>

struct lanes {
	const al_lanes *job;
	pthread_mutex_t mu;
	pthread_cond_t cv;
	int made[2]; /* slot made, not yet taken */
};

static size_t
chunk_end(const al_lanes *job, size_t c)
{
	size_t e = (c + 1) * AL_LANES_CHUNK;

	return e < job->n ? e : job->n;
}

static void *
second(void *arg)
{
	struct lanes *ln = arg;
	const al_lanes *job = ln->job;
	size_t n_chunks = (job->n + AL_LANES_CHUNK - 1) / AL_LANES_CHUNK;

	for (size_t c = 1, m = 0; c < n_chunks; c += 2, m++) {
		int s = (int)(m & 1);

		pthread_mutex_lock(&ln->mu);
		while (ln->made[s])
			pthread_cond_wait(&ln->cv, &ln->mu);
		pthread_mutex_unlock(&ln->mu);
		job->make(job->ctx, c * AL_LANES_CHUNK, chunk_end(job, c), s);
		pthread_mutex_lock(&ln->mu);
		ln->made[s] = 1;
		pthread_cond_broadcast(&ln->cv);
		pthread_mutex_unlock(&ln->mu);
	}
	return NULL;
}

void
al_lanes_run(const al_lanes *job)
{
	struct lanes ln;
	pthread_t th;
	size_t n_chunks = (job->n + AL_LANES_CHUNK - 1) / AL_LANES_CHUNK;

	ln.job = job;
	ln.made[0] = ln.made[1] = 0;
	pthread_mutex_init(&ln.mu, NULL);
	pthread_cond_init(&ln.cv, NULL);
	if (n_chunks < 2 || pthread_create(&th, NULL, second, &ln) != 0) {
		job->own(job->ctx, 0, job->n);
		goto out;
	}
	for (size_t c = 0; c < n_chunks; c++) {
		size_t begin = c * AL_LANES_CHUNK, end = chunk_end(job, c);
		int s = (int)((c / 2) & 1);

		if (c % 2 == 0) {
			job->own(job->ctx, begin, end);
			continue;
		}
		pthread_mutex_lock(&ln.mu);
		while (!ln.made[s])
			pthread_cond_wait(&ln.cv, &ln.mu);
		pthread_mutex_unlock(&ln.mu);
		job->take(job->ctx, begin, end, s);
		pthread_mutex_lock(&ln.mu);
		ln.made[s] = 0;
		pthread_cond_broadcast(&ln.cv);
		pthread_mutex_unlock(&ln.mu);
	}
	pthread_join(th, NULL);
out:
	pthread_cond_destroy(&ln.cv);
	pthread_mutex_destroy(&ln.mu);
}
