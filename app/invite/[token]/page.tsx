import type { Metadata } from "next";
import Link from "next/link";
import { Wordmark } from "@/components/layout/brand-mark";
import { RoleBadge } from "@/components/ui/badge";
import { AcceptInvitationForm } from "@/components/team/accept-invitation-form";
import { AppError } from "@/lib/server/errors";
import { previewInvitation } from "@/lib/server/team";
import type { InvitationPreviewJson } from "@/lib/schemas/team";

export const metadata: Metadata = { title: "Join a team" };
export const dynamic = "force-dynamic";

// The page an invitation mail links to: no session needed; the token is the key.
export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let invitation: InvitationPreviewJson | null = null;
  let problem: string | null = null;
  try {
    invitation = await previewInvitation({ token });
  } catch (err) {
    if (!(err instanceof AppError)) throw err;
    problem = err.message;
  }

  return (
    <div className="flex min-h-screen items-start justify-center bg-paper px-4 py-12">
      <div className="w-full max-w-md">
        <Wordmark size={24} />
        <section className="mt-6 rounded-lg border border-paper-line bg-paper-card p-6">
          {invitation ? (
            <>
              <h1 className="text-lg font-semibold text-ink">{`Join ${invitation.teamName}`}</h1>
              <p className="mt-1 text-[13px] text-ink-soft">
                You are invited as <RoleBadge role={invitation.role} />. The link works once and expires{" "}
                <span className="font-mono whitespace-nowrap">
                  {new Date(invitation.expiresAt).toISOString().replace("T", " ").slice(0, 16)} UTC
                </span>
                .
              </p>
              <div className="mt-5">
                <AcceptInvitationForm
                  token={token}
                  email={invitation.email}
                  existingAccount={invitation.existingAccount}
                />
              </div>
            </>
          ) : (
            <>
              <h1 className="text-lg font-semibold text-ink">This invitation cannot be used</h1>
              <p role="alert" className="mt-2 text-[13px] text-ink-soft">
                {problem}
              </p>
              <p className="mt-4 text-[13px]">
                <Link href="/signin" className="text-indigo underline underline-offset-2">
                  Go to sign-in
                </Link>
              </p>
            </>
          )}
        </section>
      </div>
    </div>
  );
}
