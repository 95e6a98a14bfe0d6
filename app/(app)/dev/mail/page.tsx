import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Card } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { listMailboxFor, mailboxVisible, mailDir } from "@/lib/server/mailbox";
import { smtpUrl } from "@/lib/server/mail";
import { requirePageUser } from "@/lib/server/session";
import { contentKeys } from "@/lib/workbench/row-ids";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Mailbox" };

/** Turn the URLs of a plain-text mail into links (invitation and run links are the point of most mails). */
function Linkified({ text }: { text: string }) {
  const parts = text.split(/(https?:\/\/[^\s]+)/g);
  const keys = contentKeys(parts);
  return (
    <>
      {parts.map((part, i) =>
        /^https?:\/\//.test(part) ? (
          <a key={keys[i]} href={part} className="break-all text-indigo underline underline-offset-2">
            {part}
          </a>
        ) : (
          <span key={keys[i]}>{part}</span>
        ),
      )}
    </>
  );
}

// Development mailbox: every mail the local SMTP sink received. Hidden in production when real
// SMTP is configured (see lib/server/mailbox.ts mailboxVisible).
export default async function MailboxPage() {
  if (!mailboxVisible()) notFound();
  const user = await requirePageUser();
  // The sink holds every team's mail: a member sees only mail addressed to them, an owner also
  // the own team's outgoing mail (invitations, run notifications), never another team's.
  const everything = user.role === "owner";
  const mails = await listMailboxFor({ email: user.email, role: user.role, teamId: user.teamId });
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Mailbox"
        description={
          <>
            {everything ? "Mail to you and your team's outgoing mail" : "Mail to you"} caught by the local sink (
            {smtpUrl().replace(/\/\/[^@]*@/, "//")}), stored in <span className="font-mono">{mailDir()}</span>. Not
            shown once real SMTP is configured in production.
          </>
        }
      />
      {mails.length === 0 ? (
        <Card>
          <EmptyState title="No mail yet">Invitations, comments and sign-off decisions land here.</EmptyState>
        </Card>
      ) : (
        <Card padded={false} title={`${mails.length} message${mails.length === 1 ? "" : "s"}`}>
          <ul className="divide-y divide-paper-line">
            {mails.map((m) => (
              <li key={m.id}>
                <details className="group px-4 py-2.5">
                  <summary className="flex cursor-pointer list-none flex-wrap items-baseline gap-x-4 gap-y-0.5">
                    <span className="font-mono text-[12px] text-ink-mute">
                      {m.receivedAt.replace("T", " ").slice(0, 19)} UTC
                    </span>
                    <span className="min-w-0 flex-1 truncate font-medium text-ink">{m.subject || "(no subject)"}</span>
                    <span className="truncate text-[12px] text-ink-mute">to {m.to.join(", ")}</span>
                  </summary>
                  <pre className="mt-2 whitespace-pre-wrap rounded-md border border-paper-line bg-paper-sunk/50 p-3 font-sans text-[13px] text-ink">
                    <Linkified text={m.text} />
                  </pre>
                </details>
              </li>
            ))}
          </ul>
        </Card>
      )}
    </div>
  );
}
