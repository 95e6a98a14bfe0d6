import Link from "next/link";
import { Wordmark } from "@/components/layout/brand-mark";

export default function NotFound() {
  return (
    <div className="flex min-h-screen items-start justify-center px-4 py-16 sm:items-center">
      <div className="w-full max-w-md rounded-lg border border-paper-line bg-paper-card p-6">
        <Wordmark className="mb-6" />
        <p className="font-mono text-[12px] text-ink-mute">404</p>
        <h1 className="mt-1 text-lg font-semibold">Nothing at this address</h1>
        <p className="mt-2 text-[14px] text-ink-soft">
          The page may have moved, or what it showed was deleted or belongs to another team.
        </p>
        <Link href="/boards" className="mt-5 inline-block text-[14px] font-medium text-copper hover:underline">
          Go to your boards
        </Link>
      </div>
    </div>
  );
}
