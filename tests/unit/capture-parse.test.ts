// Capture CSV parsing (lib/captures/parse.ts). Expected values are computed by hand from the
// small files below (common practice, no source): the parser must keep every sample exactly,
// apply the chosen time unit, and refuse bad files with the row and column named.
import { describe, expect, it } from "vitest";
import { CAPTURE_MAX_BYTES, CaptureError, inspectCsv, parseCapture } from "@/lib/captures/parse";

const csv = ["time_ms,probe_a,float_v", "0,1.0,0.10", "0.5,1.1,0.12", "1.0,0.9,3.30", "1.5,1.0,3.28"].join("\n");

function refusal(text: string, options: Parameters<typeof parseCapture>[1]): string {
  try {
    parseCapture(text, options);
  } catch (err) {
    expect(err).toBeInstanceOf(CaptureError);
    return (err as Error).message;
  }
  throw new Error("expected the file to be refused");
}

describe("parseCapture", () => {
  it("reads the chosen columns by name and scales the time unit", () => {
    const c = parseCapture(csv, { timeColumn: "time_ms", voltsColumn: "float_v", timeUnit: "ms" });
    expect(c.columns).toEqual(["time_ms", "probe_a", "float_v"]);
    expect(c.rows).toBe(4);
    expect(c.samples.map(([t]) => t)).toEqual([0, 0.5e-3, 1e-3, 1.5e-3]);
    expect(c.samples.map(([, v]) => v)).toEqual([0.1, 0.12, 3.3, 3.28]);
    expect(c.duration).toBeCloseTo(1.5e-3, 15);
    expect(c.min).toBe(0.1);
    expect(c.max).toBe(3.3);
  });

  it("reads files without a header by column index, with exponent notation and CRLF", () => {
    const c = parseCapture("0,2.5\r\n1e-3,2.6\r\n2E-3,-2.4e0\r\n", { timeColumn: 0, voltsColumn: 1 });
    expect(c.samples).toEqual([
      [0, 2.5],
      [0.001, 2.6],
      [0.002, -2.4],
    ]);
    expect(c.timeColumn).toBe("column 1");
  });

  it("handles semicolon-separated files and quoted headers", () => {
    const c = parseCapture('"t";"v"\n0;1\n1;2\n', { timeColumn: "t", voltsColumn: "v" });
    expect(c.samples).toEqual([
      [0, 1],
      [1, 2],
    ]);
  });

  it("refuses empty files", () => {
    expect(refusal("", { timeColumn: 0, voltsColumn: 1 })).toMatch(/empty/);
    expect(refusal(" \n\n", { timeColumn: 0, voltsColumn: 1 })).toMatch(/empty/);
    expect(refusal("t,v\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/no data rows/);
  });

  it("names the row and column of a non-numeric cell, NaN or an empty cell", () => {
    expect(refusal("t,v\n0,1\n1,abc\n", { timeColumn: "t", voltsColumn: "v" })).toBe(
      'Row 3, column "v": "abc" is not a number.',
    );
    expect(refusal("t,v\n0,1\n1,NaN\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/^Row 3, column "v": "NaN"/);
    expect(refusal("t,v\n0,1\n1,\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/^Row 3, column "v"/);
    expect(refusal("t,v\n0,1\nx,2\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/^Row 3, column "t": "x"/);
    expect(refusal("t,v\n0,1\n1,Infinity\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/not a number/);
    expect(refusal("t,v\n0,1\n1,1.5V\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/not a number/);
  });

  it("refuses binary files", () => {
    expect(refusal("t,v\n0,1\u0000\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/not a text CSV/);
    expect(refusal("\uFFFD\uFFFD\u0001\u0002", { timeColumn: 0, voltsColumn: 1 })).toMatch(/not a text CSV/);
  });

  it("requires strictly increasing time", () => {
    expect(refusal("t,v\n0,1\n1,2\n1,3\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(
      /^Row 4, column "t": time 1 is not after/,
    );
    expect(refusal("t,v\n0,1\n2,2\n1,3\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/strictly increasing/);
  });

  it("refuses unknown columns, the same column twice, and oversize files", () => {
    expect(refusal(csv, { timeColumn: "time", voltsColumn: "float_v" })).toMatch(/timeColumn: no column named "time"/);
    expect(refusal(csv, { timeColumn: "time_ms", voltsColumn: "time_ms" })).toMatch(/different column/);
    expect(refusal(csv, { timeColumn: 0, voltsColumn: 7 })).toMatch(/column 8 does not exist/);
    const big = "t,v\n" + "0,0\n".repeat(Math.ceil(CAPTURE_MAX_BYTES / 4) + 1);
    expect(refusal(big, { timeColumn: "t", voltsColumn: "v" })).toMatch(/larger than 5 MB/);
  });

  it("enforces the row limit", () => {
    const rows = Array.from({ length: 11 }, (_, i) => `${i},0`).join("\n");
    expect(refusal(`t,v\n${rows}`, { timeColumn: "t", voltsColumn: "v", maxRows: 10 })).toMatch(
      /11 data rows; at most 10/,
    );
    expect(parseCapture(`t,v\n${rows}`, { timeColumn: "t", voltsColumn: "v", maxRows: 11 }).rows).toBe(11);
  });

  it("refuses voltages outside the scenario contract's ±1000 V", () => {
    expect(refusal("t,v\n0,1\n1,1500\n", { timeColumn: "t", voltsColumn: "v" })).toMatch(/outside ±1000 V/);
  });
});

describe("inspectCsv", () => {
  it("detects the header and previews the first rows", () => {
    const info = inspectCsv(csv, 2);
    expect(info.hasHeader).toBe(true);
    expect(info.columns).toEqual(["time_ms", "probe_a", "float_v"]);
    expect(info.preview).toEqual([
      ["0", "1.0", "0.10"],
      ["0.5", "1.1", "0.12"],
    ]);
    expect(info.rows).toBe(4);
    expect(inspectCsv("0,1\n1,2").hasHeader).toBe(false);
  });
});

describe("separator and decimal comma", () => {
  // Semicolon-separated files with decimal commas are what spreadsheets in comma-decimal
  // locales write (common practice, no source); papaparse detects the separator.
  it("reads a time;volts file with decimal commas and says what it detected", () => {
    const p = parseCapture("time;volts\n0;1,5\n0,001;2,25\n0,002;-0,5\n", { timeColumn: "time", voltsColumn: "volts" });
    expect(p.delimiter).toBe(";");
    expect(p.decimalComma).toBe(true);
    expect(p.samples).toEqual([
      [0, 1.5],
      [0.001, 2.25],
      [0.002, -0.5],
    ]);
  });

  it("reads tab-separated decimal commas, and keeps refusing 1,5 in a comma-separated file", () => {
    const tab = parseCapture("t\tv\n0\t1,5\n1\t2\n", { timeColumn: "t", voltsColumn: "v" });
    expect(tab.delimiter).toBe("\t");
    expect(tab.samples[0]).toEqual([0, 1.5]);
    const comma = inspectCsv("t,v\n0,1.5\n1,2\n");
    expect(comma.delimiter).toBe(",");
    expect(comma.decimalComma).toBe(false);
    expect(refusal('t,v\n0,"1,5"\n1,2\n', { timeColumn: "t", voltsColumn: "v" })).toMatch(/"1,5" is not a number/);
  });

  it("names both columns when the same one is chosen twice, and refuses a one-column file", () => {
    expect(refusal("time;volts\n0;1\n1;2\n", { timeColumn: "time", voltsColumn: "time" })).toMatch(
      /Volts column: choose a different column.*"time"/,
    );
    expect(refusal("volts\n1\n2\n", { timeColumn: 0, voltsColumn: 0 })).toMatch(/only one column/);
  });
});
