"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { LoadError, LoadingRows } from "@/components/ui/load-state";
import { Table, TBody, TD, TH, THead, TR } from "@/components/ui/table";
import { formatDate } from "@/components/ui/format";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { captureKey, useCapture, useCaptures } from "@/lib/client/team-hooks";
import { formatQuantity } from "@/lib/design/notation";
import { CaptureSparkline } from "./capture-sparkline";
import { CaptureUpload } from "./capture-upload";

/** The team's measured waveforms: upload (owner/designer), preview, delete. */
export function CapturesView({ canEdit }: { canEdit: boolean }) {
  const { data, error, isLoading, mutate } = useCaptures();
  const [openId, setOpenId] = useState<string | null>(null);
  const open = useCapture(openId);
  const [problem, setProblem] = useState<string | null>(null);

  async function remove(id: string, name: string) {
    if (!window.confirm(`Delete the capture "${name}"? Scenarios that copied its samples keep them.`)) return;
    setProblem(null);
    try {
      await sendJson(captureKey(id), "DELETE");
      if (openId === id) setOpenId(null);
      await mutate();
    } catch (err) {
      setProblem(errorMessage(err));
    }
  }

  const items = data?.items ?? [];
  return (
    <div className="flex flex-col gap-4">
      <PageHeader
        title="Captures"
        description="Measured waveforms (time, volts) from the bench, for use as a capture component of a scenario's input signal."
      />
      {canEdit && (
        <Card title="Upload a CSV">
          <CaptureUpload onUploaded={() => void mutate()} />
        </Card>
      )}
      {problem && (
        <p role="alert" className="text-[13px] text-alert">
          {problem}
        </p>
      )}
      <Card title="Team captures" padded={false}>
        {error ? (
          <div className="p-4">
            <LoadError message={errorMessage(error)} onRetry={() => void mutate()} />
          </div>
        ) : isLoading ? (
          <LoadingRows />
        ) : items.length === 0 ? (
          <EmptyState title="No captures yet">
            {canEdit ? "Upload a CSV above." : "Designers upload them from the bench."}
          </EmptyState>
        ) : (
          <Table aria-label="Captures" stack>
            <THead>
              <TR>
                <TH>Name</TH>
                <TH>Columns</TH>
                <TH numeric>Points</TH>
                <TH numeric>Duration</TH>
                <TH numeric>Range</TH>
                <TH>Uploaded</TH>
                <TH className="text-right">Actions</TH>
              </TR>
            </THead>
            <TBody>
              {items.map((c) => (
                <TR key={c.id}>
                  <TD className="font-medium">
                    {c.name}
                    {c.sourceFilename && (
                      <div className="text-[12px] font-normal text-ink-faint">{c.sourceFilename}</div>
                    )}
                  </TD>
                  <TD className="font-mono text-[12px] text-ink-soft" label="Columns">
                    {c.columns.time}, {c.columns.value}
                  </TD>
                  <TD numeric label="Points">
                    {c.points.toLocaleString("en")}
                  </TD>
                  <TD numeric label="Duration">
                    {formatQuantity(c.duration, "s")}
                  </TD>
                  <TD numeric label="Range">
                    {formatQuantity(c.min, "V")} … {formatQuantity(c.max, "V")}
                  </TD>
                  <TD className="text-[12px] text-ink-soft" label="Uploaded">
                    {formatDate(c.createdAt)}
                  </TD>
                  <TD className="text-right whitespace-nowrap">
                    <Button size="sm" variant="ghost" onClick={() => setOpenId(openId === c.id ? null : c.id)}>
                      {openId === c.id ? "Hide" : "Preview"}
                    </Button>
                    {canEdit && (
                      <Button size="sm" variant="danger" className="ml-1.5" onClick={() => void remove(c.id, c.name)}>
                        Delete
                      </Button>
                    )}
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        )}
        {openId && (
          <div className="border-t border-paper-line p-4">
            {open.data ? (
              <>
                <p className="mb-2 text-[13px] font-medium text-ink">{open.data.name}</p>
                <CaptureSparkline samples={open.data.samples} label={`Capture ${open.data.name}`} />
              </>
            ) : open.error ? (
              <LoadError message={errorMessage(open.error)} />
            ) : (
              <LoadingRows rows={2} />
            )}
          </div>
        )}
      </Card>
    </div>
  );
}
