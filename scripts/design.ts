// `npm run design -- <spec.json|->`: a `railwise.design-spec/1` in, `railwise.design/1` on stdout.
// A bad or unreachable spec prints which field or figure and why on stderr, exits non-zero and
// writes nothing to stdout.
import { readFileSync } from "node:fs";
import { design, DesignError, DesignSpecError } from "@/lib/design";

const USAGE = "usage: npm run design -- <spec.json|->   (reads the spec from stdin with -)";

function fail(code: number, lines: string[]): never {
  process.stderr.write(lines.join("\n") + "\n");
  process.exit(code);
}

function main() {
  const args = process.argv.slice(2).filter((a) => a !== "--");
  if (args.length !== 1 || args[0] === "-h" || args[0] === "--help") fail(64, [USAGE]);
  const source = args[0];
  let text: string;
  try {
    text = readFileSync(source === "-" ? 0 : source, "utf8");
  } catch (e) {
    fail(66, [`cannot read ${source === "-" ? "stdin" : source}: ${(e as NodeJS.ErrnoException).code ?? String(e)}`]);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    fail(65, [`${source === "-" ? "stdin" : source} is not valid JSON: ${(e as Error).message}`]);
  }
  try {
    const result = design(json);
    for (const w of result.warnings) process.stderr.write(`warning: ${w}\n`);
    process.stdout.write(JSON.stringify(result, null, 2) + "\n");
  } catch (e) {
    if (e instanceof DesignSpecError) fail(65, ["Invalid design spec:", ...e.issues.map((i) => `  ${i}`)]);
    if (e instanceof DesignError) fail(2, [`Unreachable design spec: ${e.message}`]);
    throw e;
  }
}

main();
