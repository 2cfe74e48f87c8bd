/*
 * The four-bar solve of bench/kernel.ts's hand-written loop, in C, for the kernel
 * bench's comparison with optimised native code (gcc -O3 -ffp-contract=off).
 *
 * Same arithmetic as the JS loop in the same order, so the same bits: the crank pin by
 * polarInto's reduction and polynomials (src/core/geometry/trig.ts; its constants come
 * in as -D macros from SINCOS_CONSTANTS, so they are defined once), the rocker pin by
 * circle-circle intersection, P by body-local coordinates.
 *
 * Usage: fourbar ANGLES_FILE SOLVES ROUNDS OUT_FILE a0x a0y b0x b0y crank coupler rocker branch u v
 * ANGLES_FILE holds little-endian doubles (a power of two of them). Prints one line per
 * round: solves per CPU second of the process, then the checksum (sum of P's coordinates). OUT_FILE gets
 * P (x, y) for each angle, as doubles, for the bench to compare bit for bit.
 */
#define _POSIX_C_SOURCE 199309L
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

/* Math.round: the nearest integer, ties towards +infinity, the sign of x kept at zero. */
static inline double js_round(double x) {
  double t = floor(x);
  if (x - t >= 0.5) t += 1;
  return copysign(t, x);
}

static inline void polar(double cx, double cy, double r, double a, double *ox, double *oy) {
  if (!(fabs(a) <= SINCOS_REDUCTION_LIMIT)) {
    *ox = cx + r * cos(a);
    *oy = cy + r * sin(a);
    return;
  }
  double n = js_round(a * TWO_OVER_PI);
  double x = a - n * PIO2_HI - n * PIO2_LO;
  double z = x * x;
  double sinX = x + x * z * (S1 + z * (S2 + z * (S3 + z * (S4 + z * (S5 + z * S6)))));
  double hz = 0.5 * z;
  double w = 1 - hz;
  double cosX = w + ((1 - w - hz) + z * z * (C1 + z * (C2 + z * (C3 + z * (C4 + z * (C5 + z * C6))))));
  double c, s;
  switch ((long long)n & 3) {
    case 0: c = cosX; s = sinX; break;
    case 1: c = -sinX; s = cosX; break;
    case 2: c = -cosX; s = -sinX; break;
    default: c = sinX; s = -cosX; break;
  }
  *ox = cx + r * c;
  *oy = cy + r * s;
}

int main(int argc, char **argv) {
  if (argc != 15) {
    fprintf(stderr, "usage: fourbar ANGLES_FILE SOLVES ROUNDS OUT_FILE a0x a0y b0x b0y crank coupler rocker branch u v\n");
    return 2;
  }
  FILE *f = fopen(argv[1], "rb");
  if (!f) { perror(argv[1]); return 2; }
  static double angles[1 << 16];
  size_t count = fread(angles, sizeof(double), 1 << 16, f);
  fclose(f);
  if (count == 0 || (count & (count - 1)) != 0) { fprintf(stderr, "fourbar: %zu angles; expected a power of two\n", count); return 2; }
  long solves = atol(argv[2]);
  int rounds = atoi(argv[3]);
  double d[10];
  for (int i = 0; i < 10; i++) d[i] = strtod(argv[5 + i], NULL);
  const double a0x = d[0], a0y = d[1], b0x = d[2], b0y = d[3], crank = d[4], coupler = d[5], rocker = d[6], branch = d[7], u = d[8], v = d[9];
  static double pose[10];
  static double points[2 << 16];
  for (size_t i = 0; i < count; i++) { points[2 * i] = NAN; points[2 * i + 1] = NAN; }

  for (int r = 0; r <= rounds; r++) {
    struct timespec t0, t1;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t0);
    double acc = 0;
    for (long i = 0; i < solves; i++) {
      size_t j = (size_t)i & (count - 1);
      pose[0] = a0x; pose[1] = a0y; pose[2] = b0x; pose[3] = b0y;
      double ax, ay;
      polar(a0x, a0y, crank, angles[j], &ax, &ay);
      pose[4] = ax; pose[5] = ay;
      double dx = b0x - ax, dy = b0y - ay;
      double inv = 1 / (dx * dx + dy * dy);
      double k = 0.5 * (coupler * coupler - rocker * rocker) * inv + 0.5;
      double h2 = coupler * coupler * inv - k * k;
      if (!(h2 >= 0)) continue;
      double m = branch * sqrt(h2);
      double bx = ax + k * dx - m * dy, by = ay + k * dy + m * dx;
      pose[6] = bx; pose[7] = by;
      double wx = bx - ax, wy = by - ay;
      pose[8] = ax + u * wx - v * wy;
      pose[9] = ay + u * wy + v * wx;
      acc += pose[8] + pose[9];
      if (r == 0 && i < (long)count) { points[2 * j] = pose[8]; points[2 * j + 1] = pose[9]; }
    }
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &t1);
    double seconds = (double)(t1.tv_sec - t0.tv_sec) + 1e-9 * (double)(t1.tv_nsec - t0.tv_nsec);
    /* Round 0 is the warm-up that also records the points. */
    if (r > 0) printf("%.17g %.17g\n", (double)solves / seconds, acc);
  }
  FILE *o = fopen(argv[4], "wb");
  if (!o) { perror(argv[4]); return 2; }
  fwrite(points, sizeof(double), 2 * count, o);
  fclose(o);
  return 0;
}
