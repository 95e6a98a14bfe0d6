// `railwise simulate <scenario.json|-> [--csv FILE] [--solver exact|odex] [--hold-off SECONDS]`
// Prints the railwise.result/1 JSON on stdout. Bad input: a message naming each field on
// stderr, exit code 2, nothing written (the CSV is written only after a successful run, via a
// temporary file renamed into place). A run the solver gives up on exits 1 with its message.
import { renameSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { describeIssues, scenarioSchema } from "@/lib/schemas/scenario";
import { resultToCsv, simulate, toResultJson } from "@/lib/sim";
import type { SimOptions } from "@/lib/sim/types";
import { fail, readSource } from "./io";

const USAGE =
  "usage: railwise simulate <scenario.json|-> [--csv FILE] [--solver exact|odex] [--hold-off SECONDS]\n" +
  "   or: npm run simulate -- <scenario.json|-> [options]";

function parseArgs(argv: string[]) {
  let file: string | undefined;
  let csv: string | undefined;
  const options: SimOptions = {};
  const problems: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === "--") continue;
    if (a === "--csv") {
      csv = argv[++i];
      if (!csv) problems.push("--csv needs a file name");
    } else if (a === "--solver") {
      const s = argv[++i];
      if (s === "exact" || s === "odex") options.solver = s;
      else problems.push(`--solver must be "exact" or "odex" (got ${s === undefined ? "nothing" : JSON.stringify(s)})`);
    } else if (a === "--hold-off") {
      const v = Number(argv[++i]);
      if (Number.isFinite(v) && v > 0) options.holdOff = v;
      else problems.push("--hold-off must be a positive number of seconds");
    } else if (a === "-h" || a === "--help") {
      process.stdout.write(USAGE + "\n");
      process.exit(0);
    } else if (a.startsWith("--")) problems.push(`unknown option ${a}`);
    else if (file === undefined) file = a;
    else problems.push(`unexpected argument ${a}`);
  }
  if (file === undefined) problems.push("missing scenario file (or - for stdin)");
  if (problems.length) fail(2, [...problems, USAGE]);
  return { file: file!, csv, options };
}

export function runSimulate(argv: string[]): void {
  const { file, csv, options } = parseArgs(argv);
  const { name, text } = readSource(file, 2);
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    fail(2, [`${name} is not valid JSON: ${(e as Error).message}`]);
  }
  const parsed = scenarioSchema.safeParse(raw);
  if (!parsed.success) fail(2, ["Invalid scenario:", ...describeIssues(parsed.error).map((l) => "  " + l)]);
  let result;
  try {
    result = simulate(parsed.data, options);
  } catch (e) {
    fail(1, [`simulation failed: ${(e as Error).message}`]);
  }
  if (csv) {
    const target = path.resolve(csv);
    const tmp = `${target}.${process.pid}.tmp`;
    try {
      writeFileSync(tmp, resultToCsv(result));
      renameSync(tmp, target);
    } catch (e) {
      rmSync(tmp, { force: true });
      fail(1, [`cannot write ${csv}: ${(e as Error).message}`]);
    }
  }
  process.stdout.write(JSON.stringify(toResultJson(result)) + "\n");
}
