// Local SMTP sink for development, demos and tests: accepts every message on loopback and
// stores it as one JSON file in MAIL_SINK_DIR (default data/mail). The mailbox page
// (/dev/mail) and the tests read those files. Never use it as a real mail server.
//
//   npx tsx scripts/mail-sink.ts            # port SMTP_SINK_PORT, default 2525
import { SMTPServer } from "smtp-server";
import { simpleParser, type AddressObject } from "mailparser";
import { mkdirSync, writeFileSync, renameSync } from "node:fs";
import { randomBytes } from "node:crypto";
import path from "node:path";

export interface StoredMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
}

export interface MailSink {
  port: number;
  dir: string;
  close(): Promise<void>;
}

// Big enough for any mail Railwise sends; small enough that a stray client cannot fill the disk.
const MAX_MESSAGE_BYTES = 1_000_000;

function addresses(value: AddressObject | AddressObject[] | undefined): string[] {
  if (!value) return [];
  const list = Array.isArray(value) ? value : [value];
  return list.flatMap((a) => a.value.map((v) => v.address ?? "").filter(Boolean));
}

export function defaultMailDir(): string {
  return path.resolve(process.env.MAIL_SINK_DIR || "data/mail");
}

export async function startMailSink(
  options: { port?: number; host?: string; dir?: string; onMessage?: (mail: StoredMail) => void } = {},
): Promise<MailSink> {
  const dir = options.dir ?? defaultMailDir();
  const host = options.host ?? "127.0.0.1";
  mkdirSync(dir, { recursive: true });

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    banner: "Railwise local mail sink",
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const mail: StoredMail = {
            id: `${Date.now()}-${randomBytes(4).toString("hex")}`,
            receivedAt: new Date().toISOString(),
            from: addresses(parsed.from)[0] ?? (session.envelope.mailFrom ? session.envelope.mailFrom.address : ""),
            to: envelopeTo.length ? envelopeTo : addresses(parsed.to),
            subject: parsed.subject ?? "",
            text: parsed.text ?? "",
          };
          // Write then rename so a reader never sees half a file.
          const file = path.join(dir, `${mail.id}.json`);
          writeFileSync(`${file}.tmp`, JSON.stringify(mail, null, 2));
          renameSync(`${file}.tmp`, file);
          options.onMessage?.(mail);
          callback();
        })
        .catch((err: unknown) => callback(err instanceof Error ? err : new Error(String(err))));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? Number(process.env.SMTP_SINK_PORT || 2525), host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (err) => console.error(`[mail-sink] ${err.message}`));
  const address = server.server.address();
  const port = typeof address === "object" && address ? address.port : Number(options.port);
  return {
    port,
    dir,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

// Run directly: `tsx scripts/mail-sink.ts`.
const invokedDirectly = process.argv[1] && path.resolve(process.argv[1]) === path.resolve(__filename);
if (invokedDirectly) {
  startMailSink()
    .then((sink) => {
      console.log(`[mail-sink] listening on 127.0.0.1:${sink.port}, storing in ${sink.dir}`);
      const stop = () => void sink.close().then(() => process.exit(0));
      process.on("SIGINT", stop);
      process.on("SIGTERM", stop);
    })
    .catch((err: unknown) => {
      console.error(`[mail-sink] could not start: ${err instanceof Error ? err.message : String(err)}`);
      process.exit(1);
    });
}
