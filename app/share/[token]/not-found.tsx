import Link from "next/link";
import { Wordmark } from "@/components/layout/brand-mark";

// What a run-link holder sees when the link is unknown, revoked or expired (HTTP 404).
export default function SharedRunNotFound() {
  return (
    <div className="flex min-h-screen items-start justify-center bg-paper px-4 py-12">
      <div className="w-full max-w-md">
        <Wordmark size={24} />
        <section className="mt-6 rounded-lg border border-paper-line bg-paper-card p-6">
          <h1 className="text-lg font-semibold text-ink">This run link does not work</h1>
          <p role="alert" className="mt-2 text-[13px] text-ink-soft">
            It was revoked, it expired, or the address is incomplete. Ask the person who shared it for a new link.
          </p>
          <p className="mt-4 text-[13px]">
            <Link href="/signin" className="text-indigo underline underline-offset-2">
              Team members sign in here
            </Link>
          </p>
        </section>
      </div>
    </div>
  );
}
