/* acidlot bench: how many cores this machine gives a process now. One
 * thread spins a fixed loop, then two threads spin it at once; the ratio
 * of the times, doubled, is the cores they got (2.0 on two free cores).
 * On a shared virtual machine this moves from minute to minute, and the
 * bench's ratios with it: the assay uses two threads, the floor and
 * datamash one.
 * SPDX-License-Identifier: GPL-3.0-or-later */
#define _POSIX_C_SOURCE 200809L
#include <pthread.h>
#include <stdio.h>
#include <time.h>

static double
now(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + (double)t.tv_nsec * 1e-9;
}

static void *
spin(void *arg)
{
	volatile unsigned long x = 0;

	for (unsigned long i = 0; i < 200000000UL; i++)
		x += i;
	return arg;
}

int
main(void)
{
	pthread_t a, b;
	double t0, one, two;

	t0 = now();
	spin(NULL);
	one = now() - t0;
	t0 = now();
	if (pthread_create(&a, NULL, spin, NULL) != 0 ||
	    pthread_create(&b, NULL, spin, NULL) != 0)
		return 1;
	pthread_join(a, NULL);
	pthread_join(b, NULL);
	two = now() - t0;
	printf("%.2f\n", 2 * one / two);
	return 0;
}
