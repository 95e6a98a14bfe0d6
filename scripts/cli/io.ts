// Shared by the CLI subcommands: report and exit, and read a file argument or stdin ("-").
import { readFileSync } from "node:fs";

export function fail(code: number, lines: string[]): never {
  process.stderr.write(lines.join("\n") + "\n");
  process.exit(code);
}

/** The text of `file` ("-" = stdin); an unreadable source exits with `code`, naming it. */
export function readSource(file: string, code: number): { name: string; text: string } {
  const name = file === "-" ? "stdin" : file;
  try {
    return { name, text: readFileSync(file === "-" ? 0 : file, "utf8") };
  } catch (e) {
    const err = e as NodeJS.ErrnoException;
    fail(code, [`cannot read ${name}: ${err.code ? `${err.code} ${err.message.replace(/^\w+: /, "")}` : String(e)}`]);
  }
}
