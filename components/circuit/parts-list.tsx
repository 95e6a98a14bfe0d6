"use client";
// Parts list of a scenario: every resistor and capacitor of the circuit as built (source,
// filter, stage, reference divider, output), derived by lib/design/bom from the scenario itself,
// with a CSV download. A value outside the E series is shown with its warning, never silently.
import { useMemo } from "react";
import { Table, THead, TBody, TR, TH, TD } from "@/components/ui/table";
import { billOfMaterials, bomToCsv } from "@/lib/design/bom";
import { formatQuantity } from "@/lib/design/notation";
import type { Scenario } from "@/lib/schemas/scenario";

const GROUP_LABEL = {
  source: "source",
  filter: "filter",
  stage: "stage",
  reference: "reference",
  output: "output",
} as const;

export function PartsList({
  scenario,
  fileName = "parts.csv",
  showDownload = true,
}: {
  scenario: Scenario;
  fileName?: string;
  showDownload?: boolean;
}) {
  const bom = useMemo(() => billOfMaterials(scenario), [scenario]);
  const href = useMemo(() => `data:text/csv;charset=utf-8,${encodeURIComponent(bomToCsv(bom))}`, [bom]);
  return (
    <section data-testid="parts-list">
      <div className="mb-1 flex items-baseline justify-between gap-2">
        <h2 className="text-[13px] font-semibold uppercase tracking-wide text-ink-soft">Parts list</h2>
        {showDownload ? (
          <a
            className="rw-no-print text-[12px] text-copper-deep hover:underline"
            href={href}
            download={fileName}
            data-testid="parts-csv"
          >
            Download CSV
          </a>
        ) : null}
      </div>
      <Table>
        <THead>
          <TR>
            <TH>ref</TH>
            <TH>part</TH>
            <TH>where</TH>
            <TH numeric>value</TH>
            <TH>code</TH>
            <TH>series</TH>
            <TH numeric>tolerance</TH>
          </TR>
        </THead>
        <TBody>
          {bom.lines.map((l) => (
            <TR key={l.ref} data-part={l.ref}>
              <TD className="font-mono">{l.ref}</TD>
              <TD>
                {l.role}
                <span className="ml-1 text-[11px] text-ink-mute">({GROUP_LABEL[l.group]})</span>
              </TD>
              <TD className="font-mono text-[11.5px] text-ink-mute">{l.field}</TD>
              <TD numeric className="font-mono">
                {Number.isFinite(l.value) ? formatQuantity(l.value, l.kind === "capacitor" ? "F" : "Ω", 4) : "—"}
              </TD>
              <TD className="font-mono">{l.code}</TD>
              <TD>{l.series ?? <span className="text-caution">none</span>}</TD>
              <TD numeric>±{Number((l.tolerance * 100).toPrecision(3))} %</TD>
            </TR>
          ))}
        </TBody>
      </Table>
      {bom.warnings.length ? (
        <ul className="mt-1 list-disc pl-5 text-[12px] text-caution" data-testid="parts-warnings">
          {bom.warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
