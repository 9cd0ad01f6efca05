/* acidlot command line: SVG pictures of titration curves.
 * SPDX-License-Identifier: GPL-3.0-or-later
 *
 * Our own plain layout, readable in grey: pH against mL on the left
 * axis, the readings as open circles, the smoothed curve as a line, the
 * endpoint as a dashed vertical line labelled with its volume; for
 * inflection the slope dpH/dV, for gran the Gran function and its
 * fitted line, on a right axis of their own. */
#define _XOPEN_SOURCE 700
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <dirent.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli.h"
#include "plot.h"

#define W 720
#define H 440
#define LEFT 64
#define RIGHT 72
#define TOP 48
#define BOTTOM 56

/* 1 when dir does not exist or is an empty folder. */
static int
absent_or_empty(const char *dir)
{
	struct stat st;
	DIR *d;
	struct dirent *ent;
	int empty = 1;

	if (lstat(dir, &st) != 0)
		return errno == ENOENT;
	if (!S_ISDIR(st.st_mode) || (d = opendir(dir)) == NULL)
		return 0;
	while (empty && (ent = readdir(d)) != NULL)
		empty = strcmp(ent->d_name, ".") == 0 ||
			strcmp(ent->d_name, "..") == 0;
	closedir(d);
	return empty;
}

int
plot_begin(plot_set *p, const char *dir, al_curve_mode mode)
{
	char tmp[4096];

	memset(p, 0, sizeof *p);
	p->mode = mode;
	if (!absent_or_empty(dir)) {
		cli_error("--plots: %s exists and is not an empty folder", dir);
		return -1;
	}
	snprintf(tmp, sizeof tmp, "%s.partial-XXXXXX", dir);
	if (mkdtemp(tmp) == NULL) {
		cli_error("--plots: %s: %s", tmp, cli_reason(AL_OK));
		return -1;
	}
	p->dir = al_strdup(dir);
	p->tmp = al_strdup(tmp);
	if (p->dir == NULL || p->tmp == NULL) {
		rmdir(tmp);
		al_free(p->dir);
		al_free(p->tmp);
		p->dir = p->tmp = NULL;
		cli_error("%s", al_strerror(AL_ENOMEM));
		return -1;
	}
	return 0;
}

/* A file name from a curve id: letters, digits, '.', '-' and '_' kept,
 * the rest '_', a number added when the name is taken. NULL when memory
 * runs out. */
static char *
file_name(plot_set *p, const char *id)
{
	char base[96], name[128];
	size_t n = 0;

	for (const char *s = id; *s && n < 80; s++)
		base[n++] = (*s >= 'a' && *s <= 'z') || (*s >= 'A' && *s <= 'Z') ||
					    (*s >= '0' && *s <= '9') || *s == '.' ||
					    *s == '-' || *s == '_'
				    ? *s
				    : '_';
	base[n] = '\0';
	if (n == 0 || base[0] == '.')
		base[0] = '_';
	snprintf(name, sizeof name, "%s.svg", base);
	for (int k = 2;; k++) {
		size_t i = 0;

		while (i < p->n && strcmp(p->names[i], name) != 0)
			i++;
		if (i == p->n)
			break;
		snprintf(name, sizeof name, "%s-%d.svg", base, k);
	}
	if (p->n == p->cap) {
		size_t cap = 2 * p->cap + 16;
		char **grown = al_realloc(p->names, cap * sizeof *grown);

		if (grown == NULL)
			return NULL;
		p->names = grown;
		p->cap = cap;
	}
	return p->names[p->n] = al_strdup(name), p->names[p->n] ? p->names[p->n++] : NULL;
}

/* A round step for about five ticks over span (1, 2 or 5 x 10^k). */
static double
tick_step(double span)
{
	double raw = span / 5, p = pow(10, floor(log10(raw)));

	return raw / p < 1.5 ? p : raw / p < 3.5 ? 2 * p : raw / p < 7.5 ? 5 * p
								       : 10 * p;
}

struct frame {
	double x0, x1, y0, y1, z0, z1; /* mL, pH, the right axis */
};

static double
px(const struct frame *f, double x)
{
	return LEFT + (x - f->x0) / (f->x1 - f->x0) * (W - LEFT - RIGHT);
}

static double
py(const struct frame *f, double y)
{
	return H - BOTTOM - (y - f->y0) / (f->y1 - f->y0) * (H - TOP - BOTTOM);
}

static double
pz(const struct frame *f, double z)
{
	return H - BOTTOM - (z - f->z0) / (f->z1 - f->z0) * (H - TOP - BOTTOM);
}

/* The axes, their ticks and labels; right names the right axis or is
 * NULL. */
static void
axes(FILE *out, const struct frame *f, const char *right)
{
	double s = tick_step(f->x1 - f->x0);

	fprintf(out, "<rect x='%d' y='%d' width='%d' height='%d' fill='none' "
		     "stroke='#000'/>\n",
		LEFT, TOP, W - LEFT - RIGHT, H - TOP - BOTTOM);
	for (double x = ceil(f->x0 / s) * s; x <= f->x1 + 1e-9; x += s)
		fprintf(out, "<line x1='%.1f' y1='%d' x2='%.1f' y2='%d' "
			     "stroke='#000'/><text x='%.1f' y='%d' "
			     "text-anchor='middle'>%g</text>\n",
			px(f, x), H - BOTTOM, px(f, x), H - BOTTOM + 5, px(f, x),
			H - BOTTOM + 20, x);
	for (double y = f->y0; y <= f->y1 + 1e-9; y += 2)
		fprintf(out, "<line x1='%d' y1='%.1f' x2='%d' y2='%.1f' "
			     "stroke='#000'/><text x='%d' y='%.1f' "
			     "text-anchor='end'>%g</text>\n",
			LEFT - 5, py(f, y), LEFT, py(f, y), LEFT - 8,
			py(f, y) + 4, y);
	fprintf(out, "<text x='%d' y='%d' text-anchor='middle'>titrant, mL"
		     "</text>\n<text x='16' y='%d' text-anchor='middle' "
		     "transform='rotate(-90 16 %d)'>pH</text>\n",
		(W + LEFT - RIGHT) / 2, H - 14, (H + TOP - BOTTOM) / 2,
		(H + TOP - BOTTOM) / 2);
	if (right)
		fprintf(out, "<text x='%d' y='%d' text-anchor='middle' "
			     "fill='#555' transform='rotate(90 %d %d)'>%s"
			     "</text>\n",
			W - 20, (H + TOP - BOTTOM) / 2, W - 20,
			(H + TOP - BOTTOM) / 2, right);
}

/* The right axis's curve: the slope (inflection) or the Gran function
 * with its line (gran), scaled to the plot's height. */
static void
second_axis(FILE *out, struct frame *f, const al_curve *c, al_curve_mode mode,
	    const double *work, const al_curve_endpoint *e)
{
	const double *slope = work + c->n;

	f->z0 = 0;
	f->z1 = 0;
	for (size_t i = 0; i < c->n; i++) {
		double z = mode == AL_CURVE_INFLECTION
				   ? slope[i]
				   : (c->v0_ml + c->ml[i]) * pow(10, c->ph[i] - 14);

		if (isfinite(z) && z > f->z1 && (mode != AL_CURVE_GRAN || i >= e->gran_from))
			f->z1 = z;
	}
	if (!(f->z1 > 0))
		return;
	f->z1 *= 1.05;
	for (double s = tick_step(f->z1), z = 0; z <= f->z1; z += s)
		fprintf(out, "<line x1='%d' y1='%.1f' x2='%d' y2='%.1f' "
			     "stroke='#555'/><text x='%d' y='%.1f' fill='#555'>"
			     "%g</text>\n",
			W - RIGHT, pz(f, z), W - RIGHT + 5, pz(f, z),
			W - RIGHT + 8, pz(f, z) + 4, z);
	fputs("<polyline fill='none' stroke='#777' stroke-dasharray='2 3' "
	      "points='", out);
	for (size_t i = mode == AL_CURVE_GRAN ? e->gran_from : 0; i < c->n; i++)
		fprintf(out, "%.1f,%.1f ", px(f, c->ml[i]),
			pz(f, mode == AL_CURVE_INFLECTION
				      ? slope[i]
				      : (c->v0_ml + c->ml[i]) *
						pow(10, c->ph[i] - 14)));
	fputs("'/>\n", out);
	for (size_t i = e->gran_from; mode == AL_CURVE_GRAN && i < c->n; i++)
		fprintf(out, "<rect x='%.1f' y='%.1f' width='5' height='5' "
			     "fill='#fff' stroke='#555'/>\n",
			px(f, c->ml[i]) - 2.5,
			pz(f, (c->v0_ml + c->ml[i]) * pow(10, c->ph[i] - 14)) -
				2.5);
	if (mode == AL_CURVE_GRAN && e->has_volume)
		fprintf(out, "<line x1='%.1f' y1='%.1f' x2='%.1f' y2='%.1f' "
			     "stroke='#555'/>\n",
			px(f, e->volume_ml), pz(f, 0), px(f, c->ml[c->n - 1]),
			pz(f, e->gran_a + e->gran_b * c->ml[c->n - 1]));
}

/* The picture into out. */
static void
draw(FILE *out, const plot_set *p, const char *id, const al_curve *c,
     const double *work, const al_curve_endpoint *e)
{
	struct frame f = {0, c->ml[c->n - 1] > 0 ? c->ml[c->n - 1] : 1, 0, 14, 0, 1};
	char flags[256];

	fprintf(out, "<?xml version='1.0' encoding='UTF-8'?>\n"
		     "<svg xmlns='http://www.w3.org/2000/svg' width='%d' "
		     "height='%d' viewBox='0 0 %d %d' font-family='sans-serif' "
		     "font-size='12'>\n<rect width='%d' height='%d' "
		     "fill='#fff'/>\n",
		W, H, W, H, W, H);
	fputs("<text x='64' y='28' font-size='15'>curve ", out);
	cli_put_xml(out, id);
	fprintf(out, " (%s)</text>\n", al_curve_mode_names[p->mode]);
	axes(out, &f, p->mode == AL_CURVE_INFLECTION ? "slope, pH/mL"
		      : p->mode == AL_CURVE_GRAN      ? "Gran function"
						      : NULL);
	if (p->mode != AL_CURVE_FIXED)
		second_axis(out, &f, c, p->mode, work, e);
	else /* the endpoint pH the volume is read at */
		fprintf(out, "<line x1='%d' y1='%.1f' x2='%d' y2='%.1f' "
			     "stroke='#777' stroke-dasharray='2 3'/><text "
			     "x='%d' y='%.1f' fill='#555'>pH %g</text>\n",
			LEFT, py(&f, c->target_ph), W - RIGHT, py(&f, c->target_ph),
			LEFT + 6, py(&f, c->target_ph) - 4, c->target_ph);
	fputs("<polyline fill='none' stroke='#000' points='", out);
	for (size_t i = 0; i < c->n; i++)
		fprintf(out, "%.1f,%.1f ", px(&f, c->ml[i]),
			py(&f, fmin(14, fmax(0, work[i]))));
	fputs("'/>\n", out);
	for (size_t i = 0; i < c->n; i++)
		fprintf(out, "<circle cx='%.1f' cy='%.1f' r='2.5' fill='#fff' "
			     "stroke='#000'/>\n",
			px(&f, c->ml[i]), py(&f, c->ph[i]));
	if (e->has_volume)
		fprintf(out, "<line x1='%.1f' y1='%d' x2='%.1f' y2='%d' "
			     "stroke='#000' stroke-dasharray='6 4'/>\n<text "
			     "x='%.1f' y='%d' text-anchor='end'>%.3f mL at pH "
			     "%.2f</text>\n",
			px(&f, e->volume_ml), TOP, px(&f, e->volume_ml),
			H - BOTTOM, px(&f, e->volume_ml) - 6, TOP + 16,
			e->volume_ml, e->ph);
	al_curve_flags_format(e->flags, flags, sizeof flags);
	if (flags[0] || !e->has_volume)
		fprintf(out, "<text x='%d' y='%d' font-weight='bold' "
			     "text-anchor='end'>%s%s%s</text>\n",
			W - 8, 28, e->has_volume ? "" : "no endpoint",
			flags[0] && !e->has_volume ? ": " : "", flags);
	fputs("</svg>\n", out);
}

al_status
plot_curve(plot_set *p, const char *id, const al_curve *c, const double *work,
	   const al_curve_endpoint *e)
{
	char path[8192];
	const char *name;
	FILE *out;
	int bad;

	if (c->n == 0)
		return AL_OK;
	if ((name = file_name(p, id)) == NULL)
		return AL_ENOMEM;
	snprintf(path, sizeof path, "%s/%s", p->tmp, name);
	if ((out = fopen(path, "wb")) == NULL)
		return AL_EIO;
	draw(out, p, id, c, work, e);
	bad = ferror(out);
	bad |= fclose(out) != 0;
	return bad ? AL_EIO : AL_OK;
}

int
plot_commit(plot_set *p)
{
	if (p->tmp == NULL)
		return 0;
	/* an empty folder of that name gives way (plot_begin checked) */
	if ((rmdir(p->dir) != 0 && errno != ENOENT) ||
	    rename(p->tmp, p->dir) != 0) {
		cli_error("--plots: %s: %s", p->dir, cli_reason(AL_OK));
		return -1;
	}
	al_free(p->tmp);
	p->tmp = NULL;
	return 0;
}

void
plot_abort(plot_set *p)
{
	char path[8192];

	for (size_t i = 0; i < p->n; i++) {
		if (p->tmp) {
			snprintf(path, sizeof path, "%s/%s", p->tmp, p->names[i]);
			unlink(path);
		}
		al_free(p->names[i]);
	}
	if (p->tmp)
		rmdir(p->tmp);
	al_free(p->tmp);
	al_free(p->dir);
	al_free(p->names);
	memset(p, 0, sizeof *p);
}
