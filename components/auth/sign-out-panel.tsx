"use client";

import { signOut } from "next-auth/react";
import { useState } from "react";
import { Button, ButtonLink } from "@/components/ui/button";

/** Confirms before ending the session (a GET of /signout alone must not sign anyone out). */
export function SignOutPanel({ name }: { name: string }) {
  const [busy, setBusy] = useState(false);
  return (
    <div className="flex flex-col gap-4">
      <p className="text-[14px] text-ink-soft">
        Signed in as <span className="font-medium text-ink">{name}</span>. Unsaved edits in open workbenches are lost.
      </p>
      <div className="flex flex-wrap gap-2">
        <Button
          variant="primary"
          disabled={busy}
          onClick={() => {
            setBusy(true);
            void signOut({ callbackUrl: "/signin" });
          }}
        >
          {busy ? "Signing out…" : "Sign out"}
        </Button>
        <ButtonLink href="/boards">Stay signed in</ButtonLink>
      </div>
    </div>
  );
}
