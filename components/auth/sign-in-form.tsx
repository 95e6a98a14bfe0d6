"use client";

import { signIn } from "next-auth/react";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { RoleBadge, type Role } from "@/components/ui/badge";

export interface DemoAccountView {
  email: string;
  name: string;
  role: Role;
  team: string;
}

export interface SignInFormProps {
  /** Where to go after signing in (a same-site path). */
  callbackUrl: string;
  /** Listed with one-click fill when given (never in a deployment that hides them). */
  demoAccounts?: DemoAccountView[];
  demoPassword?: string;
  /** next-auth error code from the URL, if the user arrived after a failed attempt. */
  initialError?: string | null;
}

const ERRORS: Record<string, string> = {
  CredentialsSignin: "That e-mail and password do not match an account.",
  SessionRequired: "Sign in to continue.",
};

export function SignInForm({ callbackUrl, demoAccounts, demoPassword, initialError }: SignInFormProps) {
  const [email, setEmail] = useState("");
  const [password, setPassword] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(
    initialError ? (ERRORS[initialError] ?? "Sign-in failed; try again.") : null,
  );

  async function onSubmit(e: FormEvent) {
    e.preventDefault();
    if (!email.trim() || !password) {
      setError(!email.trim() ? "Enter your e-mail address." : "Enter your password.");
      return;
    }
    setBusy(true);
    setError(null);
    try {
      const res = await signIn("credentials", { email: email.trim(), password, redirect: false });
      if (!res || res.error || !res.ok) {
        setError(ERRORS[res?.error ?? ""] ?? ERRORS.CredentialsSignin);
        setBusy(false);
        return;
      }
      // A full navigation, so the server layout reads the fresh session cookie.
      window.location.assign(callbackUrl);
    } catch {
      setError("Could not reach the server; try again.");
      setBusy(false);
    }
  }

  return (
    <div className="flex flex-col gap-5">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3.5" aria-label="Sign in">
        <Field label="E-mail" htmlFor="email">
          <TextInput
            id="email"
            name="email"
            type="email"
            autoComplete="username"
            value={email}
            onChange={(e) => setEmail(e.target.value)}
            required
          />
        </Field>
        <Field label="Password" htmlFor="password">
          <TextInput
            id="password"
            name="password"
            type="password"
            autoComplete="current-password"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
            required
          />
        </Field>
        {error && (
          <p role="alert" className="rounded-md border border-alert/30 bg-alert-soft px-3 py-2 text-[13px] text-alert">
            {error}
          </p>
        )}
        <Button type="submit" variant="primary" disabled={busy} className="mt-1 w-full">
          {busy ? "Signing in…" : "Sign in"}
        </Button>
      </form>

      {demoAccounts && demoAccounts.length > 0 && demoPassword && (
        <div className="rounded-md border border-dashed border-paper-line bg-paper/70 p-3" data-testid="demo-accounts">
          <p className="text-[12px] font-semibold uppercase tracking-wide text-ink-mute">Demo accounts</p>
          <p className="mt-0.5 text-[12px] text-ink-mute">
            Password <span className="font-mono text-ink-soft">{demoPassword}</span> · choose one to fill the form.
          </p>
          <ul className="mt-2 divide-y divide-paper-line">
            {demoAccounts.map((a) => (
              <li key={a.email}>
                <button
                  type="button"
                  aria-label={`Use ${a.email} (${a.role}, ${a.team})`}
                  onClick={() => {
                    setEmail(a.email);
                    setPassword(demoPassword);
                    setError(null);
                  }}
                  className="flex w-full items-center gap-2.5 rounded px-1.5 py-1.5 text-left hover:bg-paper-sunk"
                >
                  <RoleBadge role={a.role} className="w-[4.6rem] shrink-0 justify-center" />
                  <span className="flex min-w-0 flex-col">
                    <span className="truncate font-mono text-[12px] text-ink">{a.email}</span>
                    <span className="truncate text-[11px] text-ink-mute">
                      {a.name} · {a.team}
                    </span>
                  </span>
                </button>
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}
