// Part profiles (lib/schemas/part.ts): every opamp parameter is validated by the scenario
// contract's own schema; CSV import names row and field. Values are invented generic
// parameters (common practice, no source).
import { describe, expect, it } from "vitest";
import { parsePartsCsv, partProfileBodySchema, partsToCsv } from "@/lib/schemas/part";

const opamp = {
  openLoopGain: 2e5,
  gainBandwidth: 1e6,
  slewRate: 0.5e6,
  outputHeadroomHigh: 1.5,
  outputHeadroomLow: 1.5,
  inputOffset: 2e-3,
};

describe("partProfileBodySchema", () => {
  it("accepts the canonical, stored and flat shapes alike", () => {
    for (const body of [
      { name: "general-purpose", opamp },
      { name: "general-purpose", params: opamp },
      { name: "general-purpose", ...opamp },
    ]) {
      const r = partProfileBodySchema.safeParse(body);
      expect(r.success).toBe(true);
      if (r.success) expect(r.data.opamp).toEqual(opamp);
    }
  });

  it("refuses each bad parameter with its name", () => {
    const cases: [string, unknown][] = [
      ["openLoopGain", 0],
      ["gainBandwidth", -1],
      ["slewRate", Number.NaN],
      ["outputHeadroomHigh", -0.1],
      ["inputOffset", 5],
      ["propagationDelay", -1e-9],
    ];
    for (const [key, value] of cases) {
      const r = partProfileBodySchema.safeParse({ name: "x", opamp: { ...opamp, [key]: value } });
      expect(r.success, key).toBe(false);
      if (!r.success) expect(r.error.issues[0].path.join(".")).toBe(`opamp.${key}`);
    }
    const noName = partProfileBodySchema.safeParse({ name: "  ", opamp });
    expect(noName.success).toBe(false);
  });
});

describe("parsePartsCsv", () => {
  it("imports rows with engineering notation", () => {
    const r = parsePartsCsv(
      "name,openLoopGain,gainBandwidth,slewRate,outputHeadroomHigh,outputHeadroomLow,inputOffset\nrail-to-rail CMOS,100k,1M,1.0e6,0.05,0.05,1m\n",
    );
    expect(r.errors).toEqual([]);
    expect(r.parts).toEqual([
      {
        name: "rail-to-rail CMOS",
        opamp: {
          openLoopGain: 1e5,
          gainBandwidth: 1e6,
          slewRate: 1e6,
          outputHeadroomHigh: 0.05,
          outputHeadroomLow: 0.05,
          inputOffset: 1e-3,
        },
      },
    ]);
  });

  it("round-trips through partsToCsv", () => {
    const parts = [{ name: "a, quoted", opamp: { ...opamp, propagationDelay: 2e-7 } }];
    expect(parsePartsCsv(partsToCsv(parts))).toEqual({ parts, errors: [] });
  });

  it("stores nothing and names row and field when any row is bad", () => {
    const r = parsePartsCsv(
      "name,openLoopGain,gainBandwidth,slewRate,outputHeadroomHigh,outputHeadroomLow,inputOffset\nok,1e5,1e6,1e6,0,0,0\nbad,1e5,abc,1e6,0,0,0\nworse,1e5,1e6,-3,0,0,0\n",
    );
    expect(r.parts).toEqual([]);
    expect(r.errors[0]).toBe('Row 3, gainBandwidth: "abc" is not a number.');
    expect(r.errors[1]).toMatch(/^Row 4, slewRate/);
  });

  it("refuses unknown columns, a missing name column, duplicates and empty files", () => {
    expect(parsePartsCsv("name,colour\nx,red\n").errors[0]).toMatch(/Unknown column\(s\): colour/);
    expect(parsePartsCsv("openLoopGain\n1\n").errors[0]).toMatch(/"name" column/);
    expect(parsePartsCsv("").errors[0]).toMatch(/empty/);
    const dup =
      "name,openLoopGain,gainBandwidth,slewRate,outputHeadroomHigh,outputHeadroomLow,inputOffset\nA,1e5,1e6,1e6,0,0,0\na,1e5,1e6,1e6,0,0,0\n";
    expect(parsePartsCsv(dup).errors[0]).toMatch(/Row 3, name: "a" appears twice/);
  });
});
