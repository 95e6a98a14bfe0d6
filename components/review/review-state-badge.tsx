import { Badge } from "@/components/ui/badge";
import { DECISION_LABEL, type DecisionName } from "@/lib/schemas/team";

/** The review state of a run (or of a scenario's latest run): the latest decision, or none yet. */
export function ReviewStateBadge({
  decision,
  className,
}: {
  decision: DecisionName | string | null | undefined;
  className?: string;
}) {
  const d = decision === "changes-requested" ? "changes_requested" : decision;
  if (d === "approved")
    return (
      <Badge tone="moss" className={className}>
        {DECISION_LABEL.approved}
      </Badge>
    );
  if (d === "changes_requested")
    return (
      <Badge tone="caution" className={className}>
        {DECISION_LABEL.changes_requested}
      </Badge>
    );
  return (
    <Badge tone="neutral" className={className}>
      Awaiting review
    </Badge>
  );
}
