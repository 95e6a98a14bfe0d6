// `railwise design <spec.json|->`: a `railwise.design-spec/1` in, `railwise.design/1` on stdout.
// A bad or unreachable spec prints which field or figure and why on stderr, exits non-zero and
// writes nothing to stdout.
import { design, DesignError, DesignSpecError } from "@/lib/design";
import { fail, readSource } from "./io";

const USAGE =
  "usage: railwise design <spec.json|->   (or npm run design -- <spec.json|->; - reads the spec from stdin)";

export function runDesign(argv: string[]): void {
  const args = argv.filter((a) => a !== "--");
  if (args.length === 1 && (args[0] === "-h" || args[0] === "--help")) {
    process.stdout.write(USAGE + "\n");
    return;
  }
  if (args.length !== 1) fail(64, [USAGE]);
  const { name, text } = readSource(args[0], 66);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    fail(65, [`${name} is not valid JSON: ${(e as Error).message}`]);
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
