import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/sign-in-form";
import { LoopFigure } from "@/components/auth/loop-figure";
import { Wordmark } from "@/components/layout/brand-mark";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "@/lib/demo/accounts";
import { getPageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Sign in" };
// Read the demo-account switch at request time, not at build time.
export const dynamic = "force-dynamic";

/**
 * Demo accounts are listed unless RAILWISE_HIDE_DEMO=1. NODE_ENV cannot decide this: `npm start`
 * runs a production build on a developer's machine, where the seeded accounts must be visible.
 * A real deployment sets RAILWISE_HIDE_DEMO=1 (and does not seed the demo team).
 */
function demoAccountsVisible(): boolean {
  return process.env.RAILWISE_HIDE_DEMO !== "1";
}

/** Only same-site paths: an absolute or protocol-relative URL would be an open redirect. */
function safeCallback(value: string | string[] | undefined): string {
  const v = Array.isArray(value) ? value[0] : value;
  if (!v) return "/boards";
  try {
    // next-auth passes absolute URLs of our own origin; keep only the path.
    const u = new URL(v, "http://railwise.invalid");
    const path = `${u.pathname}${u.search}${u.hash}`;
    if (!path.startsWith("/") || path.startsWith("//") || path.startsWith("/signin")) return "/boards";
    return path;
  } catch {
    return "/boards";
  }
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const params = await searchParams;
  const callbackUrl = safeCallback(params.callbackUrl);
  if (await getPageUser()) redirect(callbackUrl);
  const showDemo = demoAccountsVisible();
  const error = typeof params.error === "string" ? params.error : null;

  return (
    <div className="grid min-h-screen lg:grid-cols-[minmax(0,1.1fr)_minmax(0,1fr)]">
      <aside className="flex flex-col justify-between gap-8 border-b border-paper-line bg-paper-sunk px-6 py-6 sm:px-10 lg:border-r lg:border-b-0 lg:py-10">
        <Wordmark size={26} />
        <div className="max-w-lg">
          <h1 className="text-[26px] leading-tight font-semibold tracking-tight text-ink sm:text-[30px]">
            Switching points you can sign off.
          </h1>
          <p className="mt-3 text-[15px] text-ink-soft">
            Size comparators, hysteresis triggers and clipping gain stages with standard-value resistors, run them
            against real noise in the browser, and hand the measured run to your reviewer.
          </p>
          <LoopFigure className="mt-6 hidden w-full max-w-md sm:block" />
        </div>
        <p className="text-[12px] text-ink-mute">Behavioural simulation supports the bench; it does not replace it.</p>
      </aside>

      <main className="flex items-start justify-center px-4 py-8 sm:px-8 lg:items-center">
        <div className="w-full max-w-[26rem]">
          <h2 className="text-lg font-semibold text-ink">Sign in to your team</h2>
          <p className="mb-5 mt-1 text-[13px] text-ink-mute">Use the e-mail your team owner invited.</p>
          <SignInForm
            callbackUrl={callbackUrl}
            initialError={error}
            demoAccounts={
              showDemo
                ? DEMO_ACCOUNTS.map((a) => ({ email: a.email, name: a.name, role: a.role, team: a.team }))
                : undefined
            }
            demoPassword={showDemo ? DEMO_PASSWORD : undefined}
          />
        </div>
      </main>
    </div>
  );
}
