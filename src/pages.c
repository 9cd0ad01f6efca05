/* acidlot: first touches of a growing region's pages, in a thread of
 * their own (pages.h).
 * SPDX-License-Identifier: GPL-3.0-or-later */
#include "pages.h"

#include <string.h>

/* Maps [at, at + len) (al_prefault) and reads a byte of each page:
 * after the mapping, the first access still costs the virtual machine
 * some 5 microseconds a page; made here, it is not made by the owner. */
static void
touch(const char *at, size_t len)
{
	size_t page = al_page_bytes();

	al_prefault((void *)at, 0, len);
	for (size_t i = 0; i < len; i += page)
		(void)*(const volatile char *)(at + i);
}

/* A region with a chunk the toucher may take, or -1 (under the mutex) */
static int
next_job(const al_pages *p)
{
	for (int i = 0; i < AL_PAGES_REGIONS; i++) {
		const struct al_pages_region *g = &p->reg[i];

		if (g->r != NULL && !g->busy &&
		    (g->done + 1) * AL_PAGES_CHUNK <= g->limit)
			return i;
	}
	return -1;
}

static void *
toucher(void *arg)
{
	al_pages *p = arg;

	pthread_mutex_lock(&p->mu);
	while (!p->stop) {
		int i = next_job(p);
		struct al_pages_region *g;
		const char *at;

		if (i < 0) {
			pthread_cond_wait(&p->cv, &p->mu);
			continue;
		}
		g = &p->reg[i];
		at = g->base + g->done * AL_PAGES_CHUNK;
		g->busy = 1;
		pthread_mutex_unlock(&p->mu);
		touch(at, AL_PAGES_CHUNK);
		pthread_mutex_lock(&p->mu);
		g->busy = 0;
		g->done++;
		pthread_cond_broadcast(&p->cv);
	}
	pthread_mutex_unlock(&p->mu);
	return NULL;
}

int
al_pages_start(al_pages *p)
{
	memset(p->reg, 0, sizeof p->reg);
	p->stop = 0;
	p->running = 0;
	if (pthread_mutex_init(&p->mu, NULL) != 0)
		return -1;
	if (pthread_cond_init(&p->cv, NULL) != 0) {
		pthread_mutex_destroy(&p->mu);
		return -1;
	}
	if (pthread_create(&p->thread, NULL, toucher, p) != 0) {
		pthread_cond_destroy(&p->cv);
		pthread_mutex_destroy(&p->mu);
		return -1;
	}
	p->running = 1;
	return 0;
}

size_t
al_pages_use(al_pages *p, int which, const al_region *r, size_t used)
{
	struct al_pages_region *g = &p->reg[which];
	size_t chunks = (used + AL_PAGES_CHUNK - 1) / AL_PAGES_CHUNK;
	size_t from = 0, to = 0, ready, ask;

	pthread_mutex_lock(&p->mu);
	if (g->r == NULL) {
		/* first use, or after a move: the chunks before `done` were
		 * made ready where the region was */
		g->r = r;
		g->base = r->base;
	}
	g->limit = used + AL_PAGES_AHEAD < r->committed ? used + AL_PAGES_AHEAD
							: r->committed;
	/* the toucher is on a chunk the owner needs: let it finish */
	while (g->busy && g->done < chunks)
		pthread_cond_wait(&p->cv, &p->mu);
	if (g->done < chunks) {
		/* the toucher is behind: the owner takes these itself */
		from = g->done * AL_PAGES_CHUNK;
		to = chunks * AL_PAGES_CHUNK;
		g->done = chunks;
	}
	ready = g->done * AL_PAGES_CHUNK;
	pthread_cond_broadcast(&p->cv); /* a new limit */
	pthread_mutex_unlock(&p->mu);
	if (ready > r->committed)
		ready = r->committed;
	if (to > from)
		al_prefault(r->base, from, to < r->committed ? to : r->committed);
	/* ask again half a window before the ready end, so that the
	 * toucher's limit moves on before the owner gets there; or at
	 * that end when the owner took the chunks itself */
	ask = ready > used + AL_PAGES_AHEAD / 2 ? ready - AL_PAGES_AHEAD / 2
						: ready;
	return ask < used ? used : ask;
}

void
al_pages_drop(al_pages *p, int which)
{
	struct al_pages_region *g = &p->reg[which];

	pthread_mutex_lock(&p->mu);
	while (g->busy)
		pthread_cond_wait(&p->cv, &p->mu);
	g->r = NULL;
	pthread_mutex_unlock(&p->mu);
}

void
al_pages_stop(al_pages *p)
{
	if (!p->running)
		return;
	pthread_mutex_lock(&p->mu);
	p->stop = 1;
	pthread_cond_broadcast(&p->cv);
	pthread_mutex_unlock(&p->mu);
	pthread_join(p->thread, NULL);
	pthread_cond_destroy(&p->cv);
	pthread_mutex_destroy(&p->mu);
	p->running = 0;
}
