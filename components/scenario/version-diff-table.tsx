// A table of changed fields between two scenario documents: field, old → new.
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { diffScenarios } from "./version-diff";

export function VersionDiffTable({
  before,
  after,
  beforeTitle,
  afterTitle,
  caption,
}: {
  before: unknown;
  after: unknown;
  beforeTitle: string;
  afterTitle: string;
  caption: string;
}) {
  const changes = diffScenarios(before, after);
  if (changes.length === 0)
    return (
      <p className="text-[13px] text-ink-mute" data-testid="version-diff-empty">
        No field changed between {beforeTitle} and {afterTitle}.
      </p>
    );
  return (
    <Table aria-label={caption} data-testid="version-diff">
      <THead>
        <TR>
          <TH>Field</TH>
          <TH>{beforeTitle}</TH>
          <TH>{afterTitle}</TH>
        </TR>
      </THead>
      <TBody>
        {changes.map((c) => (
          <TR key={c.path}>
            <TD className="text-ink-soft">{c.label}</TD>
            <TD className="font-mono text-[12px] text-ink-mute line-through decoration-ink-faint/60">{c.before}</TD>
            <TD className="bg-caution-soft/60 font-mono text-[12px] font-medium text-ink">{c.after}</TD>
          </TR>
        ))}
      </TBody>
    </Table>
  );
}
