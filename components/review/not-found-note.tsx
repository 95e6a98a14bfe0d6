import Link from "next/link";
import { Card } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { HttpError, errorMessage } from "@/lib/client/fetcher";

/** A run that cannot be loaded: 404 (missing or another team's) in words, other errors as they are. */
export function NotFoundNote({ error }: { error: unknown }) {
  const missing = error instanceof HttpError && error.status === 404;
  return (
    <Card>
      <EmptyState
        title={missing ? "Run not found" : "Could not load the run"}
        action={
          <Link className="text-copper hover:underline" href="/boards">
            Back to boards
          </Link>
        }
      >
        {missing ? "It may have been deleted, or it belongs to another team." : errorMessage(error)}
      </EmptyState>
    </Card>
  );
}
