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

static void *
second(void *arg)
{
	struct lanes *ln = arg;
	const al_lanes *job = ln->job;

	for (size_t c = 1, m = 0; c < job->n_chunks; c += 2, m++) {
		int s = (int)(m & 1);

		pthread_mutex_lock(&ln->mu);
		while (ln->made[s])
			pthread_cond_wait(&ln->cv, &ln->mu);
		pthread_mutex_unlock(&ln->mu);
		job->make(job->ctx, c, s);
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

	ln.job = job;
	ln.made[0] = ln.made[1] = 0;
	pthread_mutex_init(&ln.mu, NULL);
	pthread_cond_init(&ln.cv, NULL);
	if (job->n_chunks < 2 || pthread_create(&th, NULL, second, &ln) != 0) {
		for (size_t c = 0; c < job->n_chunks; c++)
			job->own(job->ctx, c);
		goto out;
	}
	for (size_t c = 0; c < job->n_chunks; c++) {
		int s = (int)((c / 2) & 1);

		if (c % 2 == 0) {
			job->own(job->ctx, c);
			continue;
		}
		pthread_mutex_lock(&ln.mu);
		while (!ln.made[s])
			pthread_cond_wait(&ln.cv, &ln.mu);
		pthread_mutex_unlock(&ln.mu);
		job->take(job->ctx, c, s);
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
