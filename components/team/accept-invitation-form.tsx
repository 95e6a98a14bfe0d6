"use client";

import { signIn } from "next-auth/react";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { PASSWORD_MIN } from "@/lib/schemas/team";

export interface AcceptInvitationFormProps {
  token: string;
  email: string;
  existingAccount: boolean;
}

/** Set name and password, join the team, then sign in with the same credentials. */
export function AcceptInvitationForm({ token, email, existingAccount }: AcceptInvitationFormProps) {
  const [name, setName] = useState("");
  const [password, setPassword] = useState("");
  const [repeat, setRepeat] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!existingAccount && password !== repeat) {
      setError("The two passwords differ.");
      return;
    }
    setBusy(true);
    setError(null);
    try {
      await sendJson(`/api/invitations/${encodeURIComponent(token)}/accept`, "POST", {
        name: existingAccount ? email : name,
        password,
      });
    } catch (err) {
      setError(errorMessage(err));
      setBusy(false);
      return;
    }
    const res = await signIn("credentials", { email, password, redirect: false });
    if (!res || res.error || !res.ok) {
      // Joined, but the automatic sign-in failed: the sign-in page is the way on.
      window.location.assign("/signin");
      return;
    }
    window.location.assign("/boards");
  }

  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Accept invitation">
      <Field label="E-mail" htmlFor="invite-email">
        <TextInput id="invite-email" value={email} readOnly disabled />
      </Field>
      {!existingAccount && (
        <Field label="Your name" htmlFor="invite-name" hint="As your colleagues will see it on comments and sign-offs.">
          <TextInput
            id="invite-name"
            required
            maxLength={100}
            autoComplete="name"
            value={name}
            onChange={(e) => setName(e.target.value)}
          />
        </Field>
      )}
      <Field
        label={existingAccount ? "Your current password" : "Choose a password"}
        htmlFor="invite-password"
        hint={
          existingAccount
            ? "You already have a Railwise account with this address."
            : `At least ${PASSWORD_MIN} characters.`
        }
      >
        <TextInput
          id="invite-password"
          type="password"
          required
          minLength={existingAccount ? undefined : PASSWORD_MIN}
          autoComplete={existingAccount ? "current-password" : "new-password"}
          value={password}
          onChange={(e) => setPassword(e.target.value)}
        />
      </Field>
      {!existingAccount && (
        <Field label="Repeat the password" htmlFor="invite-repeat">
          <TextInput
            id="invite-repeat"
            type="password"
            required
            autoComplete="new-password"
            value={repeat}
            onChange={(e) => setRepeat(e.target.value)}
          />
        </Field>
      )}
      {error && (
        <p role="alert" className="text-[13px] text-alert">
          {error}
        </p>
      )}
      <Button type="submit" variant="primary" disabled={busy}>
        {busy ? "Joining…" : "Join the team"}
      </Button>
    </form>
  );
}
