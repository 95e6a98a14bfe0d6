import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Wordmark } from "@/components/layout/brand-mark";
import { SharedRun } from "@/components/review/shared-run";
import { AppError } from "@/lib/server/errors";
import { runForLinkToken } from "@/lib/server/review";
import type { RunRecord } from "@/lib/client/hooks";
import { getPageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Shared run", robots: { index: false, follow: false } };
// Checked on every request: a revoked or expired link stops working at once.
export const dynamic = "force-dynamic";

// A run link: no session; shows that one run (plots, readings, scenario snapshot) and nothing else.
export default async function SharedRunPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  let run: RunRecord;
  let expiresAt: string | null = null;
  let scenarioName: string | null = null;
  let sameTeam = false;
  let signedIn = false;
  try {
    const shared = await runForLinkToken({ token });
    expiresAt = shared.link.expiresAt;
    scenarioName = shared.scenarioName;
    const viewer = await getPageUser().catch(() => null);
    signedIn = !!viewer;
    sameTeam = !!viewer && viewer.teamId === shared.teamId;
    // Only the run itself crosses to the browser: no scenario or team ids, no author.
    run = {
      id: shared.id,
      scenarioId: "",
      scenarioVersion: null,
      label: shared.label,
      createdAt: shared.createdAt,
      createdBy: null,
      scenario: shared.scenario as RunRecord["scenario"],
      result: shared.result as RunRecord["result"],
      study: shared.study ?? null,
    };
  } catch (err) {
    // Unknown, revoked and expired links answer 404 (not-found.tsx beside this page says why
    // in words); the API (/api/links/:token) tells revoked/expired apart with 410.
    if (err instanceof AppError) notFound();
    throw err;
  }

  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-paper-line bg-paper-card">
        <div
          className="rw-shell flex flex-wrap items-center justify-between gap-2 px-4 py-2 sm:px-6"
          data-testid="app-header-row"
        >
          <Wordmark />
          <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-[12px]">
            <span className="text-ink-mute">
              Read-only run link{expiresAt ? ` · valid until ${expiresAt.replace("T", " ").slice(0, 16)} UTC` : ""}
            </span>
            {/* A member of the run's team goes straight to the run; others may sign in to review. */}
            {sameTeam ? (
              <Link href={`/runs/${run.id}`} className="font-medium text-copper hover:underline">
                Open this run in your team space to review
              </Link>
            ) : signedIn ? null : (
              <Link
                href={`/signin?callbackUrl=${encodeURIComponent(`/runs/${run.id}`)}`}
                className="font-medium text-copper hover:underline"
              >
                Team member? Sign in to review
              </Link>
            )}
          </div>
        </div>
      </header>
      <main className="rw-shell flex-1 px-4 py-5 sm:px-6">
        {scenarioName && (
          <p className="mb-1 text-[13px] text-ink-mute" data-testid="shared-scenario-name">
            Scenario: <span className="font-medium text-ink">{scenarioName}</span>
          </p>
        )}
        <SharedRun run={run} />
      </main>
      <footer className="rw-shell px-4 pb-5 text-[12px] text-ink-faint sm:px-6">
        Railwise · behavioural simulation of op-amp stages; confirm on the bench before a board is built.
      </footer>
    </div>
  );
}
