"use client";

import Link from "next/link";
import { useEffect } from "react";
import { Button } from "@/components/ui/button";
import { Wordmark } from "@/components/layout/brand-mark";

// Unexpected failures only: user errors are answered by the API with a message, not thrown here.
export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <div className="flex min-h-[60vh] items-start justify-center px-4 py-16 sm:items-center">
      <div className="w-full max-w-md rounded-lg border border-paper-line bg-paper-card p-6">
        <Wordmark className="mb-6" />
        <h1 className="text-lg font-semibold">This page stopped working</h1>
        <p className="mt-2 text-[14px] text-ink-soft">
          Something went wrong on our side. Your saved scenarios and runs are not affected.
          {error.digest && (
            <>
              {" "}
              Reference <span className="font-mono text-[12px]">{error.digest}</span>.
            </>
          )}
        </p>
        <div className="mt-5 flex gap-2">
          <Button variant="primary" onClick={reset}>
            Try again
          </Button>
          <Link href="/boards" className="inline-flex h-9 items-center px-3 text-[14px] text-ink-soft hover:text-ink">
            Boards
          </Link>
        </div>
      </div>
    </div>
  );
}
