import type { Metadata } from "next";
import Link from "next/link";
import { SignOutPanel } from "@/components/auth/sign-out-panel";
import { Wordmark } from "@/components/layout/brand-mark";
import { getPageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Sign out" };
export const dynamic = "force-dynamic";

export default async function SignOutPage() {
  const user = await getPageUser();
  return (
    <div className="flex min-h-screen items-start justify-center bg-paper px-4 py-16 sm:items-center">
      <div className="w-full max-w-sm rounded-lg border border-paper-line bg-paper-card p-6">
        <Wordmark className="mb-5" />
        <h1 className="mb-3 text-lg font-semibold">Sign out</h1>
        {user ? (
          <SignOutPanel name={user.name ?? user.email ?? "you"} />
        ) : (
          <p className="text-[14px] text-ink-soft">
            You are signed out.{" "}
            <Link href="/signin" className="font-medium text-copper hover:underline">
              Sign in again
            </Link>
          </p>
        )}
      </div>
    </div>
  );
}
