import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync, utimesSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";

// The simulate command spawned for real: through the compiled `railwise` bin (package.json
// "bin", built by scripts/build-cli.mjs), through `npm run simulate`, and from source with tsx.
const root = path.resolve(__dirname, "../..");
const tsx = path.join(root, "node_modules/.bin/tsx");
const pkg = JSON.parse(readFileSync(path.join(root, "package.json"), "utf8"));
const bin = path.join(root, pkg.bin.railwise);
const dir = mkdtempSync(path.join(os.tmpdir(), "railwise-sim-cli-"));
beforeAll(() => {
  const built = spawnSync(process.execPath, ["scripts/build-cli.mjs", "--if-stale"], {
    cwd: root,
    encoding: "utf8",
    timeout: 120_000,
  });
  expect(built.status, built.stderr).toBe(0);
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const run = (args: string[], input?: string) =>
  spawnSync(process.execPath, [bin, "simulate", ...args], { cwd: root, input, encoding: "utf8", timeout: 60_000 });

const good = {
  schema: "railwise.scenario/1",
  supply: { positive: 5, negative: 0 },
  opamp: {
    openLoopGain: 2e5,
    gainBandwidth: 1e6,
    slewRate: 1e6,
    outputHeadroomHigh: 0,
    outputHeadroomLow: 0,
    inputOffset: 0,
  },
  stage: { kind: "schmitt-inverting", rReference: 50e3, rFeedback: 100e3, reference: 2.5 },
  input: { components: [{ kind: "triangle", amplitude: 2.5, frequency: 100, offset: 2.5 }] },
  run: { duration: 0.02, points: 101 },
};

describe("simulate CLI", { timeout: 120_000 }, () => {
  it("prints railwise.result/1 JSON and writes the CSV", () => {
    const file = path.join(dir, "good.json");
    writeFileSync(file, JSON.stringify(good));
    const csv = path.join(dir, "out.csv");
    const r = run([file, "--csv", csv]);
    expect(r.status).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.schema).toBe("railwise.result/1");
    expect(out.samples.t).toHaveLength(101);
    // thresholds Vcc/3 and 2Vcc/3 for the three-equal-resistor network (tests/REFERENCES.md [derived])
    expect(out.metrics.upperThreshold).toBeCloseTo(10 / 3, 2);
    expect(out.metrics.lowerThreshold).toBeCloseTo(5 / 3, 2);
    const lines = readFileSync(csv, "utf8").trim().split("\n");
    expect(lines[0]).toBe("t,input,output");
    expect(lines).toHaveLength(102);
    expect(lines[101].split(",").map(Number)).toEqual([0.02, out.samples.input[100], out.samples.output[100]]);
  });

  it("reads stdin with - and honours --solver odex", () => {
    const r = run(["-", "--solver", "odex"], JSON.stringify(good));
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).solver.name).toBe("odex");
  });

  it("rejects a bad scenario naming each field, exits non-zero and writes nothing", () => {
    const bad = {
      ...good,
      supply: { positive: 5, negative: 6 },
      opamp: { ...good.opamp, slewRate: -1 },
      stage: { ...good.stage, rFeedback: 0 },
      run: { duration: 0.02, points: 1 },
    };
    const file = path.join(dir, "bad.json");
    writeFileSync(file, JSON.stringify(bad));
    const csv = path.join(dir, "bad.csv");
    const r = run([file, "--csv", csv]);
    expect(r.status).not.toBe(0);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain("supply.positive");
    expect(r.stderr).toContain("opamp.slewRate");
    expect(r.stderr).toContain("stage.rFeedback");
    expect(r.stderr).toContain("run.points");
    expect(r.stderr).not.toMatch(/at .*\.ts:\d+/); // no stack trace
    expect(existsSync(csv)).toBe(false);
  });

  it("rejects broken JSON, a missing file and an unknown solver", () => {
    const broken = run(["-"], "{ not json");
    expect(broken.status).not.toBe(0);
    expect(broken.stderr).toMatch(/not valid JSON/);
    const missing = run([path.join(dir, "nope.json")]);
    expect(missing.status).not.toBe(0);
    expect(missing.stderr).toMatch(/cannot read/);
    const solver = run(["-", "--solver", "euler"], JSON.stringify(good));
    expect(solver.status).not.toBe(0);
    expect(solver.stderr).toMatch(/--solver/);
  });

  it("the bin refuses an unknown command with its usage", () => {
    const r = spawnSync(process.execPath, [bin, "simualte", "-"], {
      cwd: root,
      input: "{}",
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(r.status).toBe(64);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain('unknown command "simualte"');
    expect(r.stderr).toContain("simulate <scenario.json|->");
  });

  it("npm run simulate reads stdin through the bin and rejects bad input the same way", () => {
    const ok = spawnSync("npm", ["run", "-s", "simulate", "--", "-"], {
      cwd: root,
      input: JSON.stringify(good),
      encoding: "utf8",
      timeout: 90_000,
    });
    expect(ok.status, ok.stderr).toBe(0);
    const out = JSON.parse(ok.stdout);
    // thresholds Vcc/3 and 2Vcc/3 for the three-equal-resistor network (tests/REFERENCES.md [derived])
    expect(out.metrics.upperThreshold).toBeCloseTo(10 / 3, 2);
    const bad = spawnSync("npm", ["run", "-s", "simulate", "--", "-"], {
      cwd: root,
      input: JSON.stringify({ ...good, run: { duration: -1, points: 101 } }),
      encoding: "utf8",
      timeout: 90_000,
    });
    expect(bad.status).not.toBe(0);
    expect(bad.stdout).toBe("");
    expect(bad.stderr).toContain("run.duration");
    expect(bad.stderr).not.toMatch(/\n\s+at /); // no stack trace
  });

  it("npm run simulate rebuilds a bin older than its sources before running it", () => {
    const inputs: string[] = JSON.parse(readFileSync(path.join(path.dirname(bin), "inputs.json"), "utf8"));
    expect(inputs).toContain("scripts/cli/simulate-command.ts");
    const newest = Math.max(...inputs.map((f) => statSync(path.join(root, f)).mtimeMs));
    const old = new Date(newest - 3_600_000);
    utimesSync(bin, old, old); // the bundle now looks an hour older than its newest source
    const r = spawnSync("npm", ["run", "-s", "simulate", "--", "-"], {
      cwd: root,
      input: JSON.stringify(good),
      encoding: "utf8",
      timeout: 120_000,
    });
    expect(r.status, r.stderr).toBe(0);
    expect(JSON.parse(r.stdout).schema).toBe("railwise.result/1");
    expect(statSync(bin).mtimeMs).toBeGreaterThanOrEqual(newest);
  });

  it("the source entry (tsx scripts/simulate.ts) gives the same result as the bin", () => {
    const fromSource = spawnSync(tsx, ["scripts/simulate.ts", "-"], {
      cwd: root,
      input: JSON.stringify(good),
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(fromSource.status, fromSource.stderr).toBe(0);
    const viaBin = run(["-"], JSON.stringify(good));
    const a = JSON.parse(fromSource.stdout);
    const b = JSON.parse(viaBin.stdout);
    // same deterministic core: identical samples and events (wall time differs)
    expect(b.samples).toEqual(a.samples);
    expect(b.events).toEqual(a.events);
    expect(b.metrics).toEqual(a.metrics);
  });
});
