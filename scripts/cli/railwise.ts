// The `railwise` command (package.json "bin"): `railwise simulate …` and `railwise design …`,
// bundled by scripts/build-cli.mjs into build/cli/railwise.cjs. Each subcommand is imported
// only when it is asked for, so `design` does not evaluate the solver and `simulate` does not
// evaluate the synthesis code.
import { config as zodConfig } from "zod/v4/core";
import { fail } from "./io";

// One process parses one document: zod's compiled fast path (generated with new Function on
// the first parse of each object schema) costs more to build than it saves here, so the CLI
// parses without it (same checks, same messages).
zodConfig({ jitless: true });

const USAGE = [
  "usage: railwise <command> [arguments]",
  "  simulate <scenario.json|-> [--csv FILE] [--solver exact|odex] [--hold-off SECONDS]",
  "           run a railwise.scenario/1 and print railwise.result/1 JSON",
  "  design <spec.json|->",
  "           turn a railwise.design-spec/1 into standard-value parts (railwise.design/1)",
];

export async function main(argv: string[]): Promise<void> {
  const [command, ...rest] = argv;
  if (command === "simulate") (await import("./simulate-command")).runSimulate(rest);
  else if (command === "design") (await import("./design-command")).runDesign(rest);
  else if (command === "-h" || command === "--help" || command === "help")
    process.stdout.write(USAGE.join("\n") + "\n");
  else fail(64, [command === undefined ? "missing command" : `unknown command ${JSON.stringify(command)}`, ...USAGE]);
}

// A reader that stops early (`railwise simulate x.json | head`) is not an error.
process.stdout.on("error", (e: NodeJS.ErrnoException) => {
  if (e.code === "EPIPE") process.exit(0);
  throw e;
});

main(process.argv.slice(2)).catch((e: unknown) => {
  // Not a user error (those exit above with a message): a fault in Railwise itself.
  process.stderr.write(`railwise: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
  process.exit(70);
});
