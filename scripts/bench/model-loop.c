/* The reference point for `npm run bench`: the single-pole op-amp model of a non-inverting
 * Schmitt trigger driven by a sine plus linearly interpolated Gaussian noise, written as plainly
 * as a C programmer would, to show what the model costs on this machine.
 *
 * It is the same model as lib/sim's exact solver, not an approximation of it:
 *  - the same five regimes (lib/sim/exact/regimes.ts): linear dvo/dt = drive = wp*(A0*vd - vo),
 *    slewing at +SR / -SRfall, held at Voh / Vol, with the same entry and exit conditions, and
 *    every regime change located inside a noise segment (closed form where there is one,
 *    bisection on the closed form otherwise). An earlier version of this loop was not this
 *    model: it took one exponential step per segment, clamped the whole step to SR*h and the
 *    rails afterwards and decided a switch only at segment ends, so during a 0.5 us slew it let
 *    the exponential run on where the real output is slew-limited and missed reversals inside
 *    a segment. Fed this noise, it counted 1,890 edges on the heavy-noise row (163 in the first
 *    50 ms), where this loop, the exact solver and odex (an independent adaptive integrator,
 *    run on the first 50 ms) all count 2,288 (203);
 *  - edges are mid-level crossings of vo located inside the segment, as lib/sim/measure.ts;
 *  - the noise is lib/sim/noise.ts bit for bit: pure-rand's 32-bit xoroshiro128+ seeded through
 *    MurmurHash3's finaliser (lib/sim/seeded.ts), 53-bit uniforms, Acklam's inverse normal CDF
 *    with the table-driven logarithm built from +, -, *, / (so every engine, and this C code
 *    compiled with -ffp-contract=off, gives the same bits). The bench checks the first knots.
 * The one simplification: the sine is interpolated linearly between noise knots together with
 * the noise (the solver keeps it exact); at 3 Hz and 1 us knots that moves the input by about
 * 1e-10 V.
 *
 * Over a segment u(tau) = u0 + s*tau, and drive = c0 + c1*tau + a*vo with
 * a = wp*(A0*beta - 1), c0 = wp*A0*(alpha*u0 + delta), c1 = wp*A0*alpha*s. In the linear regime
 * vo = p0 + p1*tau + K*exp(a*(tau - tau_s)) (first-order linear ODE, any ODE textbook), whose
 * drive p1 + a*K*exp(...) is monotonic, so slew entry has a closed form and vo has at most one
 * turning point; in the other regimes vo is affine and drive is affine in tau.
 *
 * usage: model-loop alpha beta delta A0 gbw srRise srFall voh vol
 *                   amplitude frequency offset noiseRms seed segments duration points repeats
 * prints one JSON line: median and min wall ms of the timed repeats, edges, final output, a
 * checksum of the output samples, stalls (segments cut short by the piece guard; 0 expected)
 * and the first three noise knots (the bench compares them with lib/sim/noise.ts).
 * MODEL_LOOP_TRACE=1 in the environment prints every edge time to stderr, to compare with the
 * solver's events.
 * Built by scripts/bench.ts with gcc -O2 -ffp-contract=off into build/bench/. */
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

/* ---- noise: lib/sim/seeded.ts + lib/sim/noise.ts, bit for bit ---- */

static uint32_t s00, s01, s10, s11;

static uint32_t fmix32(uint32_t h) {
  h ^= h >> 16;
  h *= 0x85ebca6bu;
  h ^= h >> 13;
  h *= 0xc2b2ae35u;
  h ^= h >> 16;
  return h;
}

/* pure-rand's xoroshiro128+ on 32-bit halves (its next()); returns the low 32 bits of s0 + s1 */
static inline uint32_t next_u32(void) {
  const uint32_t out = s00 + s10;
  const uint32_t a0 = s10 ^ s00, a1 = s11 ^ s01;
  const uint32_t o00 = s00, o01 = s01;
  s00 = (o00 << 24) ^ (o01 >> 8) ^ a0 ^ (a0 << 16);
  s01 = (o01 << 24) ^ (o00 >> 8) ^ a1 ^ ((a1 << 16) | (a0 >> 16));
  s10 = (a1 << 5) ^ (a0 >> 27);
  s11 = (a0 << 5) ^ (a1 >> 27);
  return out;
}

static void seed_generator(uint32_t seed) {
  uint32_t st[4];
  for (uint32_t k = 1; k <= 4; k++) st[k - 1] = fmix32(seed + k * 0x9e3779b9u);
  s01 = st[0];
  s00 = st[1];
  s11 = st[2];
  s10 = st[3];
  for (int i = 0; i < 8; i++) next_u32();
}

/* pure-rand's uniformFloat64: 26 + 27 bits; 0 stands in as 2^-54 (noise.ts) */
static inline double next_uniform(void) {
  const double v1 = (double)(next_u32() & 67108863u), v2 = (double)(next_u32() & 134217727u);
  const double u = v1 * 1.4901161193847656e-8 + v2 * 1.1102230246251565e-16;
  return u == 0 ? 5.551115123125783e-17 : u;
}

static const double SQRT_HALF = 0.7071067811865476, LN2 = 0.6931471805599453;

static double ln_series(double m) {
  const double z = (m - 1) / (m + 1), z2 = z * z;
  const double s =
      1 +
      z2 * (1.0 / 3 +
            z2 * (1.0 / 5 +
                  z2 * (1.0 / 7 +
                        z2 * (1.0 / 9 +
                              z2 * (1.0 / 11 +
                                    z2 * (1.0 / 13 +
                                          z2 * (1.0 / 15 +
                                                z2 * (1.0 / 17 +
                                                      z2 * (1.0 / 19 +
                                                            z2 * (1.0 / 21 +
                                                                  z2 * (1.0 / 23 +
                                                                        z2 * (1.0 / 25 +
                                                                              z2 * (1.0 / 27 +
                                                                                    z2 * (1.0 / 29))))))))))))));
  return 2 * z * s;
}

static double ln_by_scaling(double x) {
  double m = x;
  int e = 0;
  while (m < SQRT_HALF) m *= 2, e -= 1;
  while (m >= 2 * SQRT_HALF) m *= 0.5, e += 1;
  return ln_series(m) + e * LN2;
}

static double ln_cell[64];

static double portable_ln(double x) {
  if (x < 2.2250738585072014e-308) return ln_by_scaling(x);
  uint64_t bits;
  memcpy(&bits, &x, 8);
  const uint32_t hi = (uint32_t)(bits >> 32);
  const int e = (int)(hi >> 20) - 1023;
  const int k = (int)((hi >> 14) & 63);
  bits = ((uint64_t)((hi & 0x000fffffu) | 0x3ff00000u) << 32) | (bits & 0xffffffffu);
  double m;
  memcpy(&m, &bits, 8);
  const double c = 1 + (k + 0.5) / 64;
  const double z = (m - c) / (m + c), z2 = z * z;
  return e * LN2 + ln_cell[k] + 2 * z * (1 + z2 * (1.0 / 3 + z2 * (1.0 / 5 + z2 * (1.0 / 7))));
}

/* Acklam's inverse normal CDF, as lib/sim/noise.ts writes it */
static inline double quantile(double p) {
  static const double A[] = {-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2,
                             1.38357751867269e2,   -3.066479806614716e1, 2.506628277459239};
  static const double B[] = {-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2,
                             6.680131188771972e1, -1.328068155288572e1};
  static const double C[] = {-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838,
                             -2.549732539343734,    4.374664141464968,     2.938163982698783};
  static const double D[] = {7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416};
  const double P_LOW = 0.02425, P_HIGH = 1 - P_LOW;
  if (p < P_LOW || p > P_HIGH) {
    const int low = p < P_LOW;
    const double q = sqrt(-2 * portable_ln(low ? p : 1 - p));
    const double x = (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) /
                     ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
    return low ? x : -x;
  }
  const double q = p - 0.5, r = q * q;
  return ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) /
         (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1);
}

/* ---- the model ---- */

enum { LINEAR, SLEW_UP, SLEW_DOWN, RAIL_HIGH, RAIL_LOW };
enum { MAX_PIECES = 64 };

static double wp, a0, alpha, beta, delta, a, gain, sr_rise, sr_fall, voh, vol, mid;
static long edges;
static long stalls; /* segments that needed more than MAX_PIECES pieces (reported; should be 0) */
static int trace_edges; /* MODEL_LOOP_TRACE set: print each edge's time to stderr (every pass) */
static long seg_index;
static double seg_h;
static void edge(double tau) {
  edges++;
  if (trace_edges) fprintf(stderr, "%.17g\n", (double)(seg_index - 1) * seg_h + tau);
}

/* lib/sim/exact/regimes.ts enterRegime */
static int enter_regime(double vo, double drive) {
  if (vo >= voh && drive >= 0) return RAIL_HIGH;
  if (vo <= vol && drive <= 0) return RAIL_LOW;
  if (drive > sr_rise) return SLEW_UP;
  if (drive < -sr_fall) return SLEW_DOWN;
  return LINEAR;
}

/* linear-regime closed form from tau_s: vo(tau) = p0 + p1*tau + K*exp(a*(tau - tau_s)) */
static double p0, p1, K, tau_s;
static inline double lin_vo(double tau) { return p0 + p1 * tau + K * exp(a * (tau - tau_s)); }

/* first tau in (lo, hi] where sign*(lin_vo - level) > tol, given vo monotonic there; -1 if none.
 * tol (1e-12 of the magnitudes that round into vo, as the solver's AT_BOUNDARY) keeps a state
 * that sits on the level, e.g. just released from a rail, from reading as a crossing. */
static double lin_cross(double lo, double hi, double level, int sign, double tol) {
  if (!(sign * (lin_vo(hi) - level) > tol) || sign * (lin_vo(lo) - level) > tol) return -1;
  for (;;) { /* bisection to the last representable time */
    const double m = 0.5 * (lo + hi);
    if (m <= lo || m >= hi) return hi;
    if (sign * (lin_vo(m) - level) > tol) hi = m;
    else lo = m;
  }
}

/* Advance one noise segment of length h with input u0 + s*tau; returns vo at its end. Like the
 * solver's pieces, it starts in the regime its state calls for and runs regime by regime. */
static double segment(double vo, double u0, double s, double h) {
  const double c0 = gain * (alpha * u0 + delta), c1 = gain * alpha * s;
  double tau = 0;
  int r = enter_regime(vo, c0 + a * vo);
  int pieces = 0;
  for (; tau < h && pieces < MAX_PIECES; pieces++) {
    double end = h, vend;
    int next = r;
    switch (r) {
    case LINEAR: {
      p1 = -c1 / a;
      p0 = (p1 - c0) / a; /* vp' = p1 = a*vp + c0 + c1*tau */
      tau_s = tau;
      K = vo - (p0 + p1 * tau);
      /* drive = p1 + a*K*e(x), e(x) = exp(a*(tau - tau_s)), monotonic: slew entries in closed form */
      const double aK = a * K;
      if (aK != 0) {
        const double levels[2] = {sr_rise, -sr_fall};
        for (int i = 0; i < 2; i++) {
          const double ratio = (levels[i] - p1) / aK;
          if (ratio > 0) {
            const double x = tau + log(ratio) / a;
            if (x > tau && x < end) {
              end = x;
              next = i == 0 ? SLEW_UP : SLEW_DOWN;
            }
          }
        }
      }
      /* vo turns where drive = 0; split there so each part is monotonic */
      double turn = -1;
      if (aK != 0 && -p1 / aK > 0) {
        const double x = tau + log(-p1 / aK) / a;
        if (x > tau && x < end) turn = x;
      }
      const double parts[3] = {tau, turn > 0 ? turn : end, end};
      const int nparts = turn > 0 ? 2 : 1;
      const double tol = 1e-12 * (fabs(p0) + fabs(p1 * tau) + fabs(K) + fabs(voh) + fabs(vol));
      for (int j = 0; j < nparts; j++) { /* rails: the earliest crossing ends the piece */
        const double x = lin_cross(parts[j], parts[j + 1], voh, 1, tol);
        if (x > 0 && x < end) end = x, next = RAIL_HIGH;
        const double y = lin_cross(parts[j], parts[j + 1], vol, -1, tol);
        if (y > 0 && y < end) end = y, next = RAIL_LOW;
        if (end < parts[j + 1]) break;
      }
      for (int j = 0; j < nparts && parts[j] < end; j++) { /* mid crossings before the end */
        const double to = parts[j + 1] < end ? parts[j + 1] : end;
        const int up = lin_vo(to) > lin_vo(parts[j]) ? 1 : -1;
        const double x = lin_cross(parts[j], to, mid, up, 0);
        if (x > 0) edge(x);
      }
      vend = next == RAIL_HIGH ? voh : next == RAIL_LOW ? vol : lin_vo(end);
      break;
    }
    case SLEW_UP:
    case SLEW_DOWN: {
      const double rate = r == SLEW_UP ? sr_rise : -sr_fall, limit = r == SLEW_UP ? sr_rise : -sr_fall;
      /* drive(tau') = c0 + c1*tau' + a*(vo + rate*(tau' - tau)): affine; leave when it falls back inside */
      const double d0 = c0 + c1 * tau + a * vo, d1 = c1 + a * rate;
      if (d1 != 0) {
        const double x = tau + (limit - d0) / d1;
        if (x > tau && x < end && (r == SLEW_UP ? d1 < 0 : d1 > 0)) end = x, next = LINEAR;
      }
      const double rail = r == SLEW_UP ? voh : vol;
      const double xr = tau + (rail - vo) / rate;
      if (xr > tau && xr < end) end = xr, next = r == SLEW_UP ? RAIL_HIGH : RAIL_LOW;
      vend = next == RAIL_HIGH ? voh : next == RAIL_LOW ? vol : vo + rate * (end - tau);
      if ((vo < mid) != (vend < mid)) edge(tau + (mid - vo) / rate);
      break;
    }
    default: { /* held at a rail: leave when the drive turns inward */
      const double held = r == RAIL_HIGH ? voh : vol;
      const double d0 = c0 + c1 * tau + a * held;
      if (c1 != 0) {
        const double x = tau - d0 / c1;
        if (x > tau && x < end && (r == RAIL_HIGH ? c1 < 0 : c1 > 0)) end = x, next = LINEAR;
      }
      vend = held;
      break;
    }
    }
    tau = end;
    vo = vend;
    r = next;
  }
  if (tau < h) stalls++;
  return vo;
}

static double now_ms(void) {
  struct timespec ts;
  clock_gettime(CLOCK_MONOTONIC, &ts);
  return ts.tv_sec * 1e3 + ts.tv_nsec / 1e6;
}

static int compare(const void *x, const void *y) {
  double p = *(const double *)x, q = *(const double *)y;
  return (p > q) - (p < q);
}

int main(int argc, char **argv) {
  if (argc != 19) {
    fprintf(stderr,
            "usage: model-loop alpha beta delta A0 gbw srRise srFall voh vol amplitude frequency offset noiseRms "
            "seed segments duration points repeats\n");
    return 64;
  }
  int k = 1;
  alpha = atof(argv[k++]), beta = atof(argv[k++]), delta = atof(argv[k++]);
  a0 = atof(argv[k++]);
  const double gbw = atof(argv[k++]);
  sr_rise = atof(argv[k++]), sr_fall = atof(argv[k++]);
  voh = atof(argv[k++]), vol = atof(argv[k++]);
  const double amplitude = atof(argv[k++]), frequency = atof(argv[k++]), offset = atof(argv[k++]);
  const double noise_rms = atof(argv[k++]);
  const uint32_t seed = (uint32_t)strtoul(argv[k++], NULL, 10);
  const long segments = atol(argv[k++]);
  const double duration = atof(argv[k++]);
  const long points = atol(argv[k++]);
  const int repeats = atoi(argv[k++]);
  if (segments < 1 || points < 2 || repeats < 1 || (segments % (points - 1)) != 0) {
    fprintf(stderr, "segments must be a positive multiple of points - 1, repeats >= 1\n");
    return 64;
  }
  trace_edges = getenv("MODEL_LOOP_TRACE") != NULL;
  for (int c = 0; c < 64; c++) ln_cell[c] = ln_by_scaling(1 + (c + 0.5) / 64);

  const double h = duration / (double)segments;
  seg_h = h;
  wp = 2.0 * M_PI * gbw / a0;
  a = wp * (a0 * beta - 1.0);
  gain = wp * a0;
  if (fabs(a) < 1e-300) {
    fprintf(stderr, "A0*beta = 1: the linear regime has no exponential (not handled here)\n");
    return 64;
  }
  mid = 0.5 * (voh + vol);
  const double w = 2.0 * M_PI * frequency;
  const long per_sample = segments / (points - 1);
  double *samples = malloc(sizeof(double) * (size_t)points);
  double *times = malloc(sizeof(double) * (size_t)repeats);
  double knots[3];
  double vo = vol, checksum = 0;

  for (int rep = -2; rep < repeats; rep++) { /* two untimed warm-up passes */
    const double t0 = now_ms();
    seed_generator(seed);
    vo = vol; /* run.initialOutput "low" */
    edges = 0;
    stalls = 0;
    knots[0] = noise_rms * quantile(next_uniform());
    double u0 = offset + knots[0];
    samples[0] = vo;
    for (long i = 1; i <= segments; i++) {
      seg_index = i;
      const double n = noise_rms * quantile(next_uniform());
      if (i < 3) knots[i] = n;
      const double u1 = amplitude * sin(w * ((double)i * h)) + offset + n;
      vo = segment(vo, u0, (u1 - u0) / h, h);
      u0 = u1;
      if (i % per_sample == 0) samples[i / per_sample] = vo;
    }
    const double elapsed = now_ms() - t0;
    for (long j = 0; j < points; j++) checksum += samples[j];
    if (rep >= 0) times[rep] = elapsed;
  }
  qsort(times, (size_t)repeats, sizeof(double), compare);
  printf("{\"medianMs\":%.4f,\"minMs\":%.4f,\"edges\":%ld,\"finalOutput\":%.9g,\"checksum\":%.9g,"
         "\"stalls\":%ld,\"knots\":[%.17g,%.17g,%.17g]}\n",
         times[repeats / 2], times[0], edges, vo, checksum, stalls, knots[0], knots[1], knots[2]);
  free(samples);
  free(times);
  return 0;
}
