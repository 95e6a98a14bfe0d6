/* The reference point for `npm run bench`: the single-pole op-amp model of a non-inverting
 * Schmitt trigger, driven by a sine plus linearly interpolated Gaussian noise, advanced by one
 * exact exponential update per noise segment with slew-rate and output-limit clamps. Written
 * as plainly as a C programmer would, to show what the model costs on this machine; it is not
 * our solver (no event location inside a segment) and its noise is not our generator bit for
 * bit (xoroshiro128+ and the Marsaglia polar method here), only the same segment count and a
 * Gaussian of the same rms.
 *
 * Model (DEVELOPERS.md § Behavioural op-amp model): vd = alpha*u + beta*vo + delta,
 * dvo/dt = wp*(A0*vd - vo), clamped to [-SRfall, +SR], vo held in [Vol, Voh].
 * Over a segment u(tau) = u0 + s*tau, so dvo/dt = a*vo + c0 + c1*tau with
 * a = wp*(A0*beta - 1), c0 = wp*A0*(alpha*u0 + delta), c1 = wp*A0*alpha*s, whose exact solution
 * is the affine particular solution plus (vo0 - vp(0))*exp(a*tau) (a first-order linear ODE,
 * any ODE textbook).
 *
 * usage: model-loop alpha beta delta A0 gbw srRise srFall voh vol
 *                   amplitude frequency offset noiseRms segments duration points repeats
 * prints one JSON line: median and min wall ms of the timed repeats, edges, final output.
 * Sanity check (run by hand): with noiseRms 0 the bench case gives 6 edges, two per period of
 * the 3 Hz sine over 1 s; its edge count with noise differs from the solver's because the noise
 * samples differ and a switch is decided per segment, not located inside it.
 * Built by scripts/bench.ts with gcc -O2 into build/bench/. */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <time.h>

static uint64_t s0, s1;

static inline uint64_t rotl(uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }

/* xoroshiro128+ (Blackman and Vigna, public domain reference code). */
static inline uint64_t next_u64(void) {
  uint64_t a = s0, b = s1, r = a + b;
  b ^= a;
  s0 = rotl(a, 24) ^ b ^ (b << 16);
  s1 = rotl(b, 37);
  return r;
}

/* uniform in (-1, 1) from the top 53 bits */
static inline double next_signed_unit(void) { return (double)(next_u64() >> 11) * (2.0 / 9007199254740992.0) - 1.0; }

static int have_spare;
static double spare;

/* standard normal by the Marsaglia polar method (Knuth, TAOCP vol. 2, 3.4.1 C) */
static inline double next_gaussian(void) {
  if (have_spare) {
    have_spare = 0;
    return spare;
  }
  double x, y, r2;
  do {
    x = next_signed_unit();
    y = next_signed_unit();
    r2 = x * x + y * y;
  } while (r2 >= 1.0 || r2 == 0.0);
  double m = sqrt(-2.0 * log(r2) / r2);
  spare = y * m;
  have_spare = 1;
  return x * m;
}

static double now_ms(void) {
  struct timespec ts;
  clock_gettime(CLOCK_MONOTONIC, &ts);
  return ts.tv_sec * 1e3 + ts.tv_nsec / 1e6;
}

static int compare(const void *a, const void *b) {
  double x = *(const double *)a, y = *(const double *)b;
  return (x > y) - (x < y);
}

int main(int argc, char **argv) {
  if (argc != 18) {
    fprintf(stderr,
            "usage: model-loop alpha beta delta A0 gbw srRise srFall voh vol amplitude frequency offset noiseRms "
            "segments duration points repeats\n");
    return 64;
  }
  int k = 1;
  const double alpha = atof(argv[k++]), beta = atof(argv[k++]), delta = atof(argv[k++]);
  const double a0 = atof(argv[k++]), gbw = atof(argv[k++]);
  const double sr_rise = atof(argv[k++]), sr_fall = atof(argv[k++]);
  const double voh = atof(argv[k++]), vol = atof(argv[k++]);
  const double amplitude = atof(argv[k++]), frequency = atof(argv[k++]), offset = atof(argv[k++]);
  const double noise_rms = atof(argv[k++]);
  const long segments = atol(argv[k++]);
  const double duration = atof(argv[k++]);
  const long points = atol(argv[k++]);
  const int repeats = atoi(argv[k++]);
  if (segments < 1 || points < 2 || repeats < 1 || (segments % (points - 1)) != 0) {
    fprintf(stderr, "segments must be a positive multiple of points - 1, repeats >= 1\n");
    return 64;
  }

  const double h = duration / (double)segments;
  const double wp = 2.0 * M_PI * gbw / a0;
  const double a = wp * (a0 * beta - 1.0);
  const double gain = wp * a0;
  const double growth = exp(a * h); /* the same every segment: h is uniform */
  const double rise_max = sr_rise * h, fall_max = sr_fall * h;
  const double mid = 0.5 * (voh + vol);
  const double w = 2.0 * M_PI * frequency;
  const long per_sample = segments / (points - 1);
  double *samples = malloc(sizeof(double) * (size_t)points);
  double *times = malloc(sizeof(double) * (size_t)repeats);
  long edges = 0;
  double vo = vol, checksum = 0;

  for (int rep = -2; rep < repeats; rep++) { /* two untimed warm-up passes */
    s0 = 0x9E3779B97F4A7C15ull;
    s1 = 0xD1B54A32D192ED03ull;
    have_spare = 0;
    const double t0 = now_ms();
    vo = vol; /* run.initialOutput "low" */
    edges = 0;
    double u0 = offset + noise_rms * next_gaussian();
    samples[0] = vo;
    for (long i = 1; i <= segments; i++) {
      const double t1 = (double)i * h;
      const double u1 = amplitude * sin(w * t1) + offset + noise_rms * next_gaussian();
      const double s = (u1 - u0) / h;
      const double c0 = gain * (alpha * u0 + delta), c1 = gain * alpha * s;
      const double p1 = -c1 / a, p0 = (p1 - c0) / a; /* vp' = p1 = a*vp + c0 + c1*tau */
      double next = p0 + p1 * h + (vo - p0) * growth;
      double step = next - vo;
      if (step > rise_max) step = rise_max;
      else if (step < -fall_max) step = -fall_max;
      next = vo + step;
      if (next > voh) next = voh;
      else if (next < vol) next = vol;
      if ((vo < mid) != (next < mid)) edges++;
      vo = next;
      u0 = u1;
      if (i % per_sample == 0) samples[i / per_sample] = vo;
    }
    const double elapsed = now_ms() - t0;
    for (long j = 0; j < points; j++) checksum += samples[j];
    if (rep >= 0) times[rep] = elapsed;
  }
  qsort(times, (size_t)repeats, sizeof(double), compare);
  printf("{\"medianMs\":%.4f,\"minMs\":%.4f,\"edges\":%ld,\"finalOutput\":%.9g,\"checksum\":%.9g}\n",
         times[repeats / 2], times[0], edges, vo, checksum);
  free(samples);
  free(times);
  return 0;
}
