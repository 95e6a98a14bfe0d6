import { NotFoundCard } from "@/components/ui/load-state";

// A malformed id or another team's id answers 404 (lib/server/session.ts requireTeamItemOr404);
// this is the same "not found" card the page shows when the API answers 404.
export default function RunNotFound() {
  return <NotFoundCard title="Run not found" />;
}
