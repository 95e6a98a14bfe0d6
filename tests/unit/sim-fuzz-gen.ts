// Random valid scenarios for the differential fuzz (not a test file itself): seeded and
// reproducible, across every stage kind, input kind, noise, delay and slew setting.
import { parseScenario, type Scenario } from "@/lib/schemas/scenario";

/** mulberry32, a public-domain 32-bit generator (common practice, no source needed beyond that). */
export function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const KINDS = [
  "noninverting-amplifier",
  "inverting-amplifier",
  "comparator",
  "schmitt-noninverting",
  "schmitt-inverting",
  "relaxation-oscillator",
] as const;
const INPUTS = ["dc", "sine", "triangle", "ramp", "pulse", "pwl", "capture"] as const;

/** The scenario of one fuzz seed: raw JSON (what a user could send) and its parsed form. */
export function fuzzScenario(seed: number): { raw: Record<string, unknown>; scenario: Scenario } {
  const r = rng(seed * 2654435761);
  const u = (a: number, b: number) => a + (b - a) * r();
  const log = (a: number, b: number) => Math.exp(u(Math.log(a), Math.log(b)));
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
  const chance = (p: number) => r() < p;

  const supply = pick([
    { positive: 5, negative: 0 },
    { positive: 3.3, negative: 0 },
    { positive: 12, negative: 0 },
    { positive: 5, negative: -5 },
    { positive: 12, negative: -12 },
    { positive: 15, negative: -15 },
  ]);
  const span = supply.positive - supply.negative;
  const kind = KINDS[seed % KINDS.length];
  const switching = kind === "comparator" || kind.startsWith("schmitt");
  const opamp: Record<string, number> = {
    openLoopGain: log(1e4, 1e6),
    gainBandwidth: log(1e5, 1e7),
    slewRate: log(1e5, 1e8),
    outputHeadroomHigh: chance(0.3) ? 0 : u(0, 0.15 * span),
    outputHeadroomLow: chance(0.3) ? 0 : u(0, 0.15 * span),
    inputOffset: chance(0.5) ? 0 : u(-2e-3, 2e-3),
  };
  if (chance(0.3)) opamp.slewRateFall = log(1e5, 1e8);
  if (switching && chance(0.25)) opamp.propagationDelay = log(1e-7, 1e-5);
  const resistor = () => log(1e3, 1e6);
  const ref = u(supply.negative + 0.1 * span, supply.positive - 0.1 * span);
  let stage: Record<string, unknown>;
  switch (kind) {
    case "noninverting-amplifier":
      stage = { kind, rGround: resistor(), rFeedback: resistor(), reference: chance(0.5) ? 0 : ref };
      break;
    case "inverting-amplifier":
      stage = { kind, rInput: resistor(), rFeedback: resistor(), reference: chance(0.5) ? 0 : ref };
      break;
    case "comparator":
      stage = { kind, reference: ref, inputAt: pick(["noninverting", "inverting"]) };
      break;
    case "schmitt-noninverting":
      stage = { kind, rInput: resistor(), rFeedback: resistor() * 3, reference: ref };
      break;
    case "schmitt-inverting":
      stage = { kind, rReference: resistor(), rFeedback: resistor() * 3, reference: ref };
      break;
    case "relaxation-oscillator":
      stage = {
        kind,
        rReference: resistor(),
        rFeedback: resistor(),
        rTiming: log(1e3, 1e6),
        cTiming: log(1e-10, 1e-6),
        reference: ref,
      };
      break;
  }
  // Duration: the oscillator runs a few RC; the others a few input periods.
  const duration =
    kind === "relaxation-oscillator"
      ? u(2, 30) * (stage.rTiming as number) * (stage.cTiming as number)
      : log(1e-4, 0.5);
  const level = () => u(supply.negative - 0.2 * span, supply.positive + 0.2 * span);
  const amp = () => log(1e-3, 0.8) * span;
  const freq = () => u(0.5, 12) / duration;
  const components: Record<string, unknown>[] = [];
  const count = chance(0.3) ? 2 : 1;
  for (let i = 0; i < count; i++) {
    const k = pick(INPUTS);
    switch (k) {
      case "dc":
        components.push({ kind: "dc", level: level() });
        break;
      case "sine":
        components.push({
          kind: "sine",
          amplitude: amp(),
          frequency: freq(),
          offset: i === 0 ? level() : 0,
          ...(chance(0.3) ? { phase: u(0, 360) } : {}),
        });
        break;
      case "triangle":
        components.push({ kind: "triangle", amplitude: amp(), frequency: freq(), offset: i === 0 ? level() : 0 });
        break;
      case "ramp":
        components.push({
          kind: "ramp",
          from: level(),
          to: level(),
          start: u(0, 0.5) * duration,
          duration: u(0.01, 1) * duration,
        });
        break;
      case "pulse": {
        const period = duration / u(0.8, 10);
        components.push({
          kind: "pulse",
          low: level(),
          high: level(),
          period,
          duty: u(0.05, 0.95),
          ...(chance(0.6) ? { rise: u(0, 0.05) * period, fall: u(0, 0.05) * period } : {}),
          ...(chance(0.3) ? { delay: u(0, 0.3) * period } : {}),
        });
        break;
      }
      case "pwl":
      case "capture": {
        const n = 2 + Math.floor(r() * 30);
        const pts: [number, number][] = [];
        let t = chance(0.5) ? 0 : u(0, 0.2) * duration;
        for (let j = 0; j < n; j++) {
          pts.push([t, level()]);
          t += (u(0, 2) * duration) / n;
          if (k === "pwl") t += 1e-9 * duration; // strictly increasing
        }
        components.push(k === "pwl" ? { kind: k, points: pts } : { kind: k, samples: pts });
        break;
      }
    }
  }
  const input: Record<string, unknown> = { components };
  if (chance(0.3))
    input.noise = {
      rms: log(1e-3, 0.05) * span,
      bandwidth: log(50, 20000) / (2 * duration),
      seed: Math.floor(r() * 1e6),
    };
  const run: Record<string, unknown> = { duration, points: 101 + Math.floor(r() * 1900) };
  if (chance(0.4)) run.initialOutput = pick(["low", "high", "settled"]);
  const raw: Record<string, unknown> = { schema: "railwise.scenario/1", supply, opamp, stage, input, run };
  // Open-drain output on a quarter of the threshold stages, from its own stream so the rest of
  // every seed's scenario is what it was before the output was added.
  const od = rng(seed * 2654435761 + 1);
  if (switching && od() < 0.25) {
    const pullUp = Math.exp(Math.log(1e3) + (Math.log(1e5) - Math.log(1e3)) * od());
    const pullUpTo = od() < 0.5 ? "positive" : supply.positive * (0.5 + 0.5 * od());
    raw.output = {
      kind: "open-drain",
      pullUp,
      pullUpTo,
      ...(od() < 0.5 ? { load: { r: pullUp * (10 + 90 * od()) } } : {}),
    };
  }
  return { raw, scenario: parseScenario(raw) };
}
