import { NotFoundCard } from "@/components/ui/load-state";
import { HttpError, errorMessage } from "@/lib/client/fetcher";

/** A run that cannot be loaded: 404 (missing or another team's) in words, other errors as they are. */
export function NotFoundNote({ error }: { error: unknown }) {
  const missing = error instanceof HttpError && error.status === 404;
  return missing ? (
    <NotFoundCard title="Run not found" />
  ) : (
    <NotFoundCard title="Could not load the run">{errorMessage(error)}</NotFoundCard>
  );
}
