// Noise of a measured capture: rms and bandwidth, in the terms of the scenario's noise model.
//
// Estimator (ours, documented in the UI):
// 1. Detrend with a moving linear least-squares fit over a centred window. What the fit cannot
//    follow is taken as noise, so the window should be short against the signal and long
//    against the noise: by default about 10 noise knot intervals (10/(2B̂) = 5/B̂, B̂ refined
//    over a few passes from an 11-sample start), at least 5 samples. Steps and bends that the line
//    cannot follow still count as noise: the estimate errs on the high (safe) side.
// 2. rms = root mean square of the residual, leaving out residuals beyond 4.5 robust
//    standard deviations (1.4826 × median absolute deviation; Hampel's rule): steps and
//    contact bounce the line cannot follow are events, not noise (Gaussian noise loses
//    0.0007 % of its samples to this cut). Then divided by √(1 − 1/n): the fitted line absorbs
//    1/n of the variance of n independent values at the window centre (the leverage of the
//    centre point in a least-squares line fit is 1/n). Noise values are independent only
//    every 1/(2B), so n is the smaller of the samples in the window and window·2B̂.
// 3. bandwidth = rate of sign changes of the residual (changes per second). In Railwise's
//    noise model (independent Gaussian values every 1/(2B), linearly interpolated) two
//    neighbouring values differ in sign with probability 1/2, so the residual changes sign
//    B times per second on average: the rate estimates B directly [derived]. (For an ideal
//    flat band-limited process, Rice's formula gives 2B/√3 crossings per second instead —
//    Rice 1944, "Mathematical analysis of random noise", §3.3 — so a capture of analog,
//    brick-wall noise reads about 15 % high; conservative for the study.)
// 4. modelRms = the `noise.rms` of the scenario contract that reproduces the capture. The
//    contract's rms is that of its knots; between knots the linear blend of two independent
//    values has mean square σ²((1−x)² + x²), 2σ²/3 on average [derived]. A capture that
//    resolves the noise (several samples per knot interval) therefore reads σ·√(2/3), so
//    modelRms = rms·√(3/2); a capture whose samples are already independent (limited by
//    sampling) reads σ itself, so modelRms = rms.
export interface CaptureNoiseEstimate {
  /** rms of the detrended capture (V). */
  rms: number;
  /** The scenario contract's noise.rms that reproduces it (V): use this in the study. */
  modelRms: number;
  bandwidth: number;
  /** Samples used and the detrend window (samples, seconds). */
  samples: number;
  window: number;
  windowSeconds: number;
  /** Half the capture's mean sample rate: the widest bandwidth the capture can show. */
  nyquist: number;
  /** The bandwidth estimate is near the capture's own limit: the true noise may be wider. */
  limitedBySampling: boolean;
}

export function estimateCaptureNoise(
  samples: ReadonlyArray<readonly [number, number]>,
  windowSeconds?: number,
): CaptureNoiseEstimate {
  if (windowSeconds === undefined && samples.length >= 16) {
    const n = samples.length;
    const meanDt = (samples[n - 1][0] - samples[0][0]) / (n - 1);
    // A window shorter than a knot interval over-counts crossings, and a longer window then
    // reads fewer: a few passes settle where the window and the bandwidth agree.
    let est = estimateWith(samples, 11 * meanDt);
    for (let pass = 0; pass < 6 && est.bandwidth > 0; pass++) {
      const next = estimateWith(samples, 5 / est.bandwidth);
      const settled = Math.abs(next.bandwidth / est.bandwidth - 1) < 0.02;
      est = next;
      if (settled) break;
    }
    return est;
  }
  return estimateWith(samples, windowSeconds);
}

function estimateWith(samples: ReadonlyArray<readonly [number, number]>, windowSeconds?: number): CaptureNoiseEstimate {
  const n = samples.length;
  if (n < 16) throw new Error("capture needs at least 16 samples to estimate its noise");
  const t0 = samples[0][0];
  const span = samples[n - 1][0] - t0;
  if (!(span > 0)) throw new Error("capture time must increase");
  const meanDt = span / (n - 1);
  const wSec = windowSeconds ?? span / 50;
  let w = Math.max(5, Math.round(wSec / meanDt));
  if (w % 2 === 0) w++;
  w = Math.min(w, n % 2 === 1 ? n : n - 1);
  const half = (w - 1) / 2;
  // Prefix sums of t, v, t², t·v (time relative to the start to keep them well conditioned).
  const St = new Float64Array(n + 1),
    Sv = new Float64Array(n + 1),
    Stt = new Float64Array(n + 1),
    Stv = new Float64Array(n + 1);
  for (let i = 0; i < n; i++) {
    const t = samples[i][0] - t0,
      v = samples[i][1];
    St[i + 1] = St[i] + t;
    Sv[i + 1] = Sv[i] + v;
    Stt[i + 1] = Stt[i] + t * t;
    Stv[i + 1] = Stv[i] + t * v;
  }
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    // Shift the window inwards at the ends so it always holds w samples.
    const a = Math.min(Math.max(0, i - half), n - w),
      b = a + w;
    const m = w,
      st = St[b] - St[a],
      sv = Sv[b] - Sv[a],
      stt = Stt[b] - Stt[a],
      stv = Stv[b] - Stv[a];
    const den = m * stt - st * st;
    const slope = den > 0 ? (m * stv - st * sv) / den : 0;
    const icpt = (sv - slope * st) / m;
    residual[i] = samples[i][1] - (icpt + slope * (samples[i][0] - t0));
  }
  const abs = Array.from(residual, Math.abs).sort((a, b) => a - b);
  const mad = abs[Math.floor(n / 2)];
  const cut = 4.5 * 1.4826 * mad;
  let ss = 0,
    kept = 0,
    changes = 0;
  for (let i = 0; i < n; i++) {
    if (Math.abs(residual[i]) <= cut) {
      ss += residual[i] * residual[i];
      kept++;
    }
    if (i > 0 && residual[i] !== 0 && residual[i - 1] !== 0 && residual[i] > 0 !== residual[i - 1] > 0) changes++;
  }
  const bandwidth = changes / span;
  const independent = Math.max(2, Math.min(w, w * meanDt * 2 * bandwidth));
  const rms = Math.sqrt(ss / Math.max(1, kept) / (1 - 1 / independent));
  const nyquist = 1 / (2 * meanDt);
  const limitedBySampling = bandwidth > 0.6 * nyquist;
  const modelRms = limitedBySampling ? rms : rms * Math.sqrt(1.5);
  return { rms, modelRms, bandwidth, samples: n, window: w, windowSeconds: w * meanDt, nyquist, limitedBySampling };
}
