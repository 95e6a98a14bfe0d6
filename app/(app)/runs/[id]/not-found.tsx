import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";

// A malformed id or another team's id answers 404 (lib/server/session.ts requireTeamItemOr404);
// this is the same "not found" card the page shows when the API answers 404.
export default function RunNotFound() {
  return (
    <div className="rounded-lg border border-paper-line bg-paper-card">
      <EmptyState
        title="Run not found"
        action={
          <Link className="text-copper hover:underline" href="/boards">
            Back to boards
          </Link>
        }
      >
        It may have been deleted, or it belongs to another team.
      </EmptyState>
    </div>
  );
}
