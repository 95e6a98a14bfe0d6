"use client";

import Link from "next/link";
import type { ReactNode } from "react";
import { Badge } from "@/components/ui/badge";
import { formatDate, formatRelative } from "@/components/ui/format";
import { LoadGate } from "@/components/ui/load-state";
import { PageHeader } from "@/components/ui/page-header";
import { SafetyCaution } from "@/components/safety-caution";
import { personName, useBoard, useScenario, type ScenarioRecord } from "@/lib/client/hooks";
import { ScenarioTables } from "./scenario-tables";

export interface ScenarioReadViewProps {
  scenarioId: string;
  /** Force the safety caution on or off; by default it follows the scenario and board names. */
  showCaution?: boolean;
  /** Extra controls in the title row (e.g. a link to runs). */
  actions?: ReactNode;
}

/** The scenario as readable tables, for members who may not edit it (and until the workbench loads). */
export function ScenarioReadView({ scenarioId, showCaution, actions }: ScenarioReadViewProps) {
  const { data, error, isLoading, mutate } = useScenario(scenarioId);
  return (
    <LoadGate
      data={data}
      error={error}
      isLoading={isLoading}
      onRetry={() => void mutate()}
      notFoundTitle="Scenario not found"
    >
      {(record) => <ScenarioReadBody record={record} showCaution={showCaution} actions={actions} />}
    </LoadGate>
  );
}

function ScenarioReadBody({
  record,
  showCaution,
  actions,
}: {
  record: ScenarioRecord;
  showCaution?: boolean;
  actions?: ReactNode;
}) {
  const board = useBoard(record.boardId);
  return (
    <>
      <ScenarioHeading record={record} boardName={board.data?.name} actions={actions} />
      {/* Only the scenario's own words: a board description lists every stage on it ("…bilge…"),
          which would put the caution on a preamp too. */}
      <SafetyCaution show={showCaution} texts={[record.name, record.scenario.name]} className="mb-4" />
      <ScenarioTables scenario={record.scenario} />
    </>
  );
}

export interface ScenarioHeadingProps {
  record: ScenarioRecord;
  boardName?: string;
  actions?: ReactNode;
}

/** Breadcrumb, name, version and last edit: the title row of any scenario screen. */
export function ScenarioHeading({ record, boardName, actions }: ScenarioHeadingProps) {
  return (
    <PageHeader
      eyebrow={
        <nav aria-label="Breadcrumb" className="flex flex-wrap items-center gap-1">
          <Link href="/boards" className="hover:text-ink hover:underline">
            Boards
          </Link>
          <span aria-hidden>/</span>
          <Link href={`/boards/${record.boardId}`} className="hover:text-ink hover:underline">
            {boardName ?? "Board"}
          </Link>
        </nav>
      }
      title={record.name}
      description={
        <span className="flex flex-wrap items-center gap-x-2 gap-y-1">
          <Badge>v{record.version}</Badge>
          <span>
            updated <span title={formatDate(record.updatedAt)}>{formatRelative(record.updatedAt)}</span> by{" "}
            {personName(record.updatedBy)}
          </span>
        </span>
      }
      actions={actions}
    />
  );
}
