"use client";

import { useState, type FormEvent } from "react";
import { Button, ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { RoleBadge } from "@/components/ui/badge";
import { Field, Select, TextInput } from "@/components/ui/field";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { useAudit, useInvitations, useMembers } from "@/lib/client/team-hooks";
import { ROLE_NAMES, emailSchema, type RoleName } from "@/lib/schemas/team";
import { fieldIssueText } from "@/lib/workbench/screen-words";
import { formatDate } from "@/components/ui/format";
import { describeAction, describeDetails, describeTarget } from "./format";

const ROLE_HELP: Record<RoleName, string> = {
  owner: "everything, plus members and boards",
  designer: "scenarios, runs, captures, parts, run links",
  reviewer: "reads, comments and signs off",
  viewer: "reads only",
};

export interface TeamViewProps {
  me: { id: string; role: RoleName; teamName: string };
  /** The local mail sink's page, when mail goes there (demos, development). */
  mailboxHref?: string | null;
}

export function TeamView({ me, mailboxHref }: TeamViewProps) {
  const isOwner = me.role === "owner";
  const members = useMembers();
  const invitations = useInvitations(isOwner);
  const audit = useAudit(isOwner);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<string | null>(null);

  async function act(key: string, fn: () => Promise<unknown>) {
    setBusy(key);
    setError(null);
    try {
      await fn();
      await Promise.all([
        members.mutate(),
        isOwner ? audit.mutate() : undefined,
        isOwner ? invitations.mutate() : undefined,
      ]);
    } catch (err) {
      setError(errorMessage(err));
    } finally {
      setBusy(null);
    }
  }

  const rows = members.data?.items ?? [];
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Team"
        description={`${me.teamName} · ${rows.length} member${rows.length === 1 ? "" : "s"}`}
        actions={
          mailboxHref ? (
            <ButtonLink
              href={mailboxHref}
              size="sm"
              title="Mail caught by the local SMTP sink (invitations, comments, sign-offs)"
            >
              Mailbox
            </ButtonLink>
          ) : undefined
        }
      />

      {error && (
        <p role="alert" className="rounded-md border border-alert/30 bg-alert-soft px-3 py-2 text-[13px] text-alert">
          {error}
        </p>
      )}

      <div className={isOwner ? "grid items-start gap-4 lg:grid-cols-[minmax(0,1fr)_320px]" : "grid gap-4"}>
        <Card title="Members" padded={false}>
          {members.error ? (
            <p className="p-4 text-[13px] text-alert">{errorMessage(members.error)}</p>
          ) : (
            <Table aria-label="Members" stack>
              <THead>
                <TR>
                  <TH>Name</TH>
                  <TH>E-mail</TH>
                  <TH>Role</TH>
                  <TH>Joined</TH>
                  {isOwner && <TH className="text-right">Actions</TH>}
                </TR>
              </THead>
              <TBody>
                {rows.map((m) => (
                  <TR key={m.id} data-testid={`member-${m.email}`}>
                    <TD className="font-medium">
                      {m.name}
                      {m.id === me.id && <span className="ml-1.5 text-[12px] font-normal text-ink-faint">(you)</span>}
                    </TD>
                    <TD className="break-all text-ink-soft" label="E-mail">
                      {m.email}
                    </TD>
                    <TD label="Role">
                      {isOwner ? (
                        <Select
                          aria-label={`Role of ${m.name}`}
                          className="h-7! w-32 min-w-32 py-0 text-[13px]"
                          value={m.role}
                          disabled={busy !== null}
                          onChange={(e) =>
                            act(`role-${m.id}`, () =>
                              sendJson(`/api/team/members/${m.id}`, "PATCH", { role: e.target.value }),
                            )
                          }
                        >
                          {ROLE_NAMES.map((r) => (
                            <option key={r} value={r}>
                              {r}
                            </option>
                          ))}
                        </Select>
                      ) : (
                        <RoleBadge role={m.role} />
                      )}
                    </TD>
                    <TD className="font-mono text-[12px] text-ink-soft" label="Joined">
                      {formatDate(m.joinedAt).slice(0, 10)}
                    </TD>
                    {isOwner && (
                      <TD className="text-right">
                        <Button
                          size="sm"
                          variant="danger"
                          disabled={busy !== null}
                          onClick={() => {
                            if (window.confirm(`Remove ${m.name} (${m.email}) from the team?`)) {
                              void act(`remove-${m.id}`, () => sendJson(`/api/team/members/${m.id}`, "DELETE"));
                            }
                          }}
                        >
                          Remove
                        </Button>
                      </TD>
                    )}
                  </TR>
                ))}
              </TBody>
            </Table>
          )}
        </Card>

        {isOwner && <InviteCard onInvited={() => Promise.all([invitations.mutate(), audit.mutate()])} />}
      </div>

      {isOwner && (
        <Card title="Pending invitations" padded={false}>
          {(invitations.data?.items ?? []).length === 0 ? (
            <p className="px-4 py-3 text-[13px] text-ink-mute">No invitation is waiting for an answer.</p>
          ) : (
            <Table aria-label="Pending invitations" stack>
              <THead>
                <TR>
                  <TH>E-mail</TH>
                  <TH>Role</TH>
                  <TH>Sent</TH>
                  <TH>Expires</TH>
                  <TH className="text-right">Actions</TH>
                </TR>
              </THead>
              <TBody>
                {invitations.data!.items.map((inv) => (
                  <TR key={inv.id}>
                    <TD>{inv.email}</TD>
                    <TD label="Role">
                      <RoleBadge role={inv.role} />
                    </TD>
                    <TD className="font-mono text-[12px] text-ink-soft" label="Sent">
                      {formatDate(inv.createdAt)}
                    </TD>
                    <TD className="font-mono text-[12px] text-ink-soft" label="Expires">
                      {formatDate(inv.expiresAt)}
                    </TD>
                    <TD className="text-right">
                      <Button
                        size="sm"
                        variant="ghost"
                        disabled={busy !== null}
                        onClick={() =>
                          act(`withdraw-${inv.id}`, () => sendJson(`/api/team/invitations/${inv.id}`, "DELETE"))
                        }
                      >
                        Withdraw
                      </Button>
                    </TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          )}
        </Card>
      )}

      {isOwner && (
        <Card
          title="Audit log"
          description="Membership, link, sign-off and delete actions; newest first."
          padded={false}
        >
          {(audit.data?.items ?? []).length === 0 ? (
            <p className="px-4 py-3 text-[13px] text-ink-mute">Nothing recorded yet.</p>
          ) : (
            <Table aria-label="Audit log" stack>
              <THead>
                <TR>
                  <TH>When</TH>
                  <TH>Who</TH>
                  <TH>What</TH>
                  <TH>About</TH>
                  <TH>Details</TH>
                </TR>
              </THead>
              <TBody>
                {audit.data!.items.map((e) => (
                  <TR key={e.id}>
                    <TD className="whitespace-nowrap font-mono text-[12px] text-ink-soft">{formatDate(e.createdAt)}</TD>
                    <TD label="Who">{e.actorName ?? "(removed account)"}</TD>
                    <TD label="What">{describeAction(e.action)}</TD>
                    <TD className="max-w-[22rem] break-words" label="About">
                      {describeTarget(e)}
                    </TD>
                    <TD className="text-ink-soft" label="Details">
                      {describeDetails(e.details)}
                    </TD>
                  </TR>
                ))}
              </TBody>
            </Table>
          )}
        </Card>
      )}
    </div>
  );
}

function InviteCard({ onInvited }: { onInvited: () => Promise<unknown> }) {
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<RoleName>("designer");
  const [status, setStatus] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const [sending, setSending] = useState(false);
  const [emailError, setEmailError] = useState<string | null>(null);

  async function submit(e: FormEvent) {
    e.preventDefault();
    setStatus(null);
    if (!email.trim()) {
      setEmailError("Enter the e-mail address of the person to invite.");
      document.getElementById("invite-email")?.focus();
      return;
    }
    // The same check as the server's, said with the field's label (the schema says "email").
    const checked = emailSchema.safeParse(email);
    if (!checked.success) {
      setEmailError(
        `${fieldIssueText(checked.error.issues[0]?.message ?? "is not an e-mail address", { code: "email", label: "E-mail" })}, such as name@company.example.`,
      );
      document.getElementById("invite-email")?.focus();
      return;
    }
    setEmailError(null);
    setSending(true);
    try {
      const res = await sendJson<{ email: string; mailSent?: boolean }>("/api/team/invitations", "POST", {
        email,
        role,
      });
      setStatus(
        res.mailSent === false
          ? {
              tone: "error",
              text: `Invitation saved, but the mail to ${res.email} could not be sent; check the mail server and send it again.`,
            }
          : { tone: "ok", text: `Invitation sent to ${res.email}.` },
      );
      setEmail("");
      await onInvited();
    } catch (err) {
      setStatus({ tone: "error", text: errorMessage(err) });
    } finally {
      setSending(false);
    }
  }

  return (
    <Card title="Invite by e-mail" description="A single-use link, valid for 72 hours.">
      {/* noValidate: the form says what is wrong in its own words, beside the field. */}
      <form onSubmit={submit} className="flex flex-col gap-3" noValidate>
        <Field label="E-mail" htmlFor="invite-email" error={emailError}>
          <TextInput
            id="invite-email"
            type="email"
            required
            aria-invalid={!!emailError}
            value={email}
            onChange={(e) => {
              setEmail(e.target.value);
              setEmailError(null);
            }}
            placeholder="name@company.example"
          />
        </Field>
        <Field label="Role" htmlFor="invite-role" hint={ROLE_HELP[role]}>
          <Select id="invite-role" value={role} onChange={(e) => setRole(e.target.value as RoleName)}>
            {ROLE_NAMES.map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </Select>
        </Field>
        <Button type="submit" variant="primary" disabled={sending}>
          {sending ? "Sending…" : "Send invitation"}
        </Button>
        {status && (
          <p
            role={status.tone === "error" ? "alert" : "status"}
            className={status.tone === "error" ? "text-[13px] text-alert" : "text-[13px] text-moss"}
          >
            {status.text}
          </p>
        )}
      </form>
    </Card>
  );
}
