import "server-only";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";

// Reads what the local SMTP sink (scripts/mail-sink.ts) stored, for the /dev/mail page.

export interface MailboxMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

export function mailDir(): string {
  return path.resolve(/*turbopackIgnore: true*/ process.env.MAIL_SINK_DIR || "data/mail");
}

/**
 * The mailbox page is shown outside production, and in production while mail goes to the
 * local sink (no SMTP_URL: `npm start` demos). RAILWISE_SHOW_MAILBOX=1 forces it on, =0 off.
 */
export function mailboxVisible(): boolean {
  const flag = process.env.RAILWISE_SHOW_MAILBOX;
  if (flag === "0" || flag === "false") return false;
  if (flag) return true;
  return process.env.NODE_ENV !== "production" || !process.env.SMTP_URL;
}

export async function listMailbox(limit = 100): Promise<MailboxMessage[]> {
  let names: string[];
  try {
    // The folder is configured at run time; keep the bundler from tracing the whole project for it.
    names = (await readdir(/*turbopackIgnore: true*/ mailDir())).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  // File names start with the arrival time in ms, so a reverse sort is newest first.
  names.sort().reverse();
  const out: MailboxMessage[] = [];
  for (const name of names.slice(0, limit)) {
    try {
      out.push(JSON.parse(await readFile(path.join(/*turbopackIgnore: true*/ mailDir(), name), "utf8")) as MailboxMessage);
    } catch {
      // A file being written or damaged is skipped, not fatal.
    }
  }
  return out;
}
