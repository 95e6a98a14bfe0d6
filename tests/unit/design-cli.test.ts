// The design CLI, spawned for real: good specs print `railwise.design/1` on stdout; bad or
// unreachable ones exit non-zero, name the figure or field on stderr and print nothing on stdout.
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { design } from "@/lib/design";

const ROOT = path.resolve(__dirname, "../..");
const TSX = path.join(ROOT, "node_modules/.bin/tsx");
// The compiled `railwise` bin (package.json "bin", built by scripts/build-cli.mjs).
const BIN = path.join(ROOT, JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")).bin.railwise);
const dir = mkdtempSync(path.join(tmpdir(), "railwise-design-cli-"));
beforeAll(() => {
  const built = spawnSync(process.execPath, ["scripts/build-cli.mjs", "--if-stale"], {
    cwd: ROOT,
    encoding: "utf8",
    timeout: 120_000,
  });
  expect(built.status, built.stderr).toBe(0);
});

const BASE = {
  schema: "railwise.design-spec/1",
  kind: "schmitt-inverting",
  supply: { positive: 5, negative: 0 },
  opamp: {
    openLoopGain: 2e5,
    gainBandwidth: 1e6,
    slewRate: 1e6,
    outputHeadroomHigh: 0.05,
    outputHeadroomLow: 0.05,
    inputOffset: 0.001,
  },
  target: { upperThreshold: 3.3, lowerThreshold: 1.7 },
  series: "E24",
  tolerance: 0.01,
  reference: "auto",
};

let n = 0;
function run(spec: unknown, viaStdin = false) {
  const file = path.join(dir, `spec-${++n}.json`);
  const text = typeof spec === "string" ? spec : JSON.stringify(spec);
  writeFileSync(file, text);
  const r = spawnSync(process.execPath, [BIN, "design", viaStdin ? "-" : file], {
    cwd: ROOT,
    input: viaStdin ? text : undefined,
    encoding: "utf8",
    timeout: 60_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe("npm run design", () => {
  it("prints railwise.design/1 for a good spec (through the npm script)", () => {
    const file = path.join(dir, "good.json");
    writeFileSync(file, JSON.stringify(BASE));
    const r = spawnSync("npm", ["run", "-s", "design", "--", file], { cwd: ROOT, encoding: "utf8", timeout: 90_000 });
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.schema).toBe("railwise.design/1");
    expect(out.stage.kind).toBe("schmitt-inverting");
    expect(Object.keys(out.achieved)).toEqual(expect.arrayContaining(["upperThreshold", "lowerThreshold", "gain"]));
    expect(out.worstCase.upperThreshold).toHaveLength(2);
    expect(out.parts.map((p: { role: string }) => p.role)).toEqual(["rTop", "rBottom", "rFeedback"]);
  });

  it("reads the spec from stdin with -", () => {
    const r = run(
      {
        ...BASE,
        kind: "noninverting-amplifier",
        target: { gain: 10 },
        reference: 0,
        supply: { positive: 5, negative: -5 },
      },
      true,
    );
    expect(r.code, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).achieved.gain).toBeCloseTo(10, 2);
  });

  it("the source entry (tsx scripts/design.ts) prints the same design as the bin", () => {
    const text = JSON.stringify(BASE);
    const fromSource = spawnSync(TSX, ["scripts/design.ts", "-"], {
      cwd: ROOT,
      input: text,
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(fromSource.status, fromSource.stderr).toBe(0);
    const viaBin = run(BASE, true);
    expect(viaBin.code, viaBin.stderr).toBe(0);
    expect(JSON.parse(viaBin.stdout)).toEqual(JSON.parse(fromSource.stdout));
  });

  it("rejects a missing spec file and a missing argument without a stack trace", () => {
    const missing = spawnSync(process.execPath, [BIN, "design", path.join(dir, "nope.json")], {
      cwd: ROOT,
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(missing.status).toBe(66);
    expect(missing.stdout).toBe("");
    expect(missing.stderr).toMatch(/cannot read .*nope\.json: ENOENT/);
    const none = spawnSync(process.execPath, [BIN, "design"], { cwd: ROOT, encoding: "utf8", timeout: 60_000 });
    expect(none.status).toBe(64);
    expect(none.stderr).toMatch(/usage: railwise design/);
  });

  // Spawned: the three rejections issue 4 names, and one per kind of failure.
  const rejects: [string, unknown, RegExp][] = [
    [
      "upper ≤ lower",
      { ...BASE, target: { upperThreshold: 1.7, lowerThreshold: 3.3 } },
      /target\.upperThreshold.*must be above target\.lowerThreshold/,
    ],
    [
      "deadband wider than the output swing",
      { ...BASE, target: { upperThreshold: 4.99, lowerThreshold: 0.01 } },
      /upperThreshold: the deadband .* narrower than the output swing/,
    ],
    [
      "thresholds above what the reference can reach",
      { ...BASE, kind: "schmitt-noninverting", target: { upperThreshold: 12.5, lowerThreshold: 11.4 } },
      /upperThreshold: .*reference of 10\.\d+ V, at or above the positive supply/,
    ],
    [
      "fixed reference contradicting the thresholds",
      { ...BASE, reference: 2.5, target: { upperThreshold: 4, lowerThreshold: 3.5 } },
      /upperThreshold: with reference 2\.5 V the thresholds cannot both be met/,
    ],
    ["tolerance out of range", { ...BASE, tolerance: 5 }, /tolerance: tolerance must be a fraction between 0 and 0\.2/],
    [
      "gain beyond the resistor range",
      { ...BASE, kind: "noninverting-amplifier", target: { gain: 5000 }, reference: 0 },
      /gain: needs rFeedback\/rGround = 51\d\d(\.\d+)?, beyond what resistors/,
    ],
    ["not JSON", "{ nope", /not valid JSON/],
  ];
  for (const [name, spec, message] of rejects) {
    it(`rejects: ${name}`, () => {
      const r = run(spec);
      expect(r.code).not.toBe(0);
      expect(r.stdout).toBe("");
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
    });
  }
});

// The same messages in process (no spawn cost): design() throws what the CLI prints.
describe("design() rejections name the field or figure", () => {
  const rejects: [string, unknown, RegExp][] = [
    [
      "upper = lower on a Schmitt trigger",
      { ...BASE, target: { upperThreshold: 2, lowerThreshold: 2 } },
      /target\.upperThreshold/,
    ],
    [
      "threshold below the negative supply",
      { ...BASE, kind: "comparator", target: { threshold: -0.5 } },
      /threshold: .*at or below the negative supply/,
    ],
    ["negative tolerance", { ...BASE, tolerance: -0.01 }, /tolerance/],
    [
      "frequency out of reach",
      { ...BASE, kind: "relaxation-oscillator", target: { frequency: 1e-4 } },
      /frequency: .*outside what resistors/,
    ],
    [
      "oscillator too fast for the slew rate",
      { ...BASE, kind: "relaxation-oscillator", target: { frequency: 20_000 } },
      /frequency: at 20000 Hz the output edges .* fill 19\.\d+ % of the period/,
    ],
    [
      "duty with a centred fixed reference",
      {
        ...BASE,
        kind: "relaxation-oscillator",
        supply: { positive: 5, negative: -5 },
        opamp: { ...BASE.opamp, inputOffset: 0 },
        reference: 0,
        target: { frequency: 100, duty: 0.3 },
      },
      /duty: reference 0 V sits at the centre of the output swing, so the duty stays at 0\.5/,
    ],
    [
      "sensor on an amplifier",
      {
        ...BASE,
        kind: "inverting-amplifier",
        target: { gain: 2 },
        reference: 0,
        sensor: { kind: "divider", rTop: 1e4, rBottom: 1e4 },
      },
      /sensor: a sensor applies to threshold stages only/,
    ],
    [
      "NTC model without a curve",
      { ...BASE, sensor: { kind: "ntc", model: { r25: 1e4 }, rFixed: 1e4, position: "bottom" } },
      /sensor\.model/,
    ],
    ["wrong target for the kind", { ...BASE, target: { gain: 3 } }, /target\.gain does not apply to schmitt-inverting/],
    ["unknown series", { ...BASE, series: "E7" }, /series: series must be one of/],
    ["missing supply", { ...BASE, supply: undefined }, /supply/],
  ];
  for (const [name, spec, message] of rejects) {
    it(`rejects: ${name}`, () => {
      if (typeof spec === "string") {
        expect(() => JSON.parse(spec)).toThrow();
        return;
      }
      expect(() => design(spec)).toThrow(message);
    });
  }
});
