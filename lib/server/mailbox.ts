import "server-only";
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";
import { Op } from "sequelize";
import { getModels } from "@/models";
import { hashToken, plausibleToken } from "./tokens";
import { isId } from "./ids";

// Reads what the local SMTP sink (scripts/mail-sink.ts) stored, for the /dev/mail page, and
// decides who may see which mail: the sink holds every team's mail in one folder, so the page
// shows a member only mail addressed to them, and an owner also their own team's outgoing mail
// (a mail belongs to the team whose invitation or run its links point at) — never another's.

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
      out.push(
        JSON.parse(await readFile(path.join(/*turbopackIgnore: true*/ mailDir(), name), "utf8")) as MailboxMessage,
      );
    } catch {
      // A file being written or damaged is skipped, not fatal.
    }
  }
  return out;
}

export interface MailboxViewer {
  email: string | null;
  role: string;
  teamId: string;
}

const INVITE_LINK = /\/invite\/([A-Za-z0-9_-]{43})(?![A-Za-z0-9_-])/g;
const RUN_LINK = /\/runs\/([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})/gi;

/** The teams a mail's links point at (invitations by token hash, runs by id). */
async function mailTeams(mails: MailboxMessage[]): Promise<Map<string, Set<string>>> {
  const tokensByMail = new Map<string, string[]>();
  const runsByMail = new Map<string, string[]>();
  for (const m of mails) {
    const text = typeof m.text === "string" ? m.text : "";
    tokensByMail.set(m.id, [...text.matchAll(INVITE_LINK)].map((x) => x[1]).filter(plausibleToken));
    runsByMail.set(m.id, [...text.matchAll(RUN_LINK)].map((x) => x[1].toLowerCase()).filter(isId));
  }
  const hashes = [...new Set([...tokensByMail.values()].flat().map(hashToken))];
  const runIds = [...new Set([...runsByMail.values()].flat())];
  const { Invitation, Run } = getModels();
  const inviteTeam = new Map<string, string>();
  const runTeam = new Map<string, string>();
  if (hashes.length) {
    for (const row of await Invitation.findAll({
      where: { tokenHash: { [Op.in]: hashes } },
      attributes: ["tokenHash", "teamId"],
    })) {
      inviteTeam.set(row.tokenHash, row.teamId as string);
    }
  }
  if (runIds.length) {
    for (const row of await Run.findAll({ where: { id: { [Op.in]: runIds } }, attributes: ["id", "teamId"] }))
      runTeam.set(row.id, row.teamId as string);
  }
  const out = new Map<string, Set<string>>();
  for (const m of mails) {
    const teams = new Set<string>();
    for (const t of tokensByMail.get(m.id) ?? []) {
      const team = inviteTeam.get(hashToken(t));
      if (team) teams.add(team);
    }
    for (const r of runsByMail.get(m.id) ?? []) {
      const team = runTeam.get(r);
      if (team) teams.add(team);
    }
    out.set(m.id, teams);
  }
  return out;
}

/**
 * The mail `viewer` may see: mail addressed to them, and for an owner also mail whose every
 * Railwise link points into the owner's team. A mail with a link into another team is never
 * shown to this team's owner unless it is addressed to them.
 */
export async function listMailboxFor(viewer: MailboxViewer, limit = 100): Promise<MailboxMessage[]> {
  const all = await listMailbox(limit);
  const mine = (viewer.email ?? "").trim().toLowerCase();
  const addressed = (m: MailboxMessage) =>
    !!mine && Array.isArray(m.to) && m.to.some((to) => String(to).trim().toLowerCase() === mine);
  if (viewer.role !== "owner") return all.filter(addressed);
  const teams = await mailTeams(all);
  return all.filter((m) => {
    if (addressed(m)) return true;
    const t = teams.get(m.id);
    return !!t && t.size > 0 && [...t].every((id) => id === viewer.teamId);
  });
}
