"use client";
// A study as saved with a run (runs.study), read-only: on the run page and the shared-link page.
import { Card } from "@/components/ui/card";
import type { SavedStudy } from "@/lib/studies/saved";
import { NoiseMarginResult, ToleranceSpreadResult } from "./study-readouts";

function meta(part: { wallMs?: number; workers?: number; config: { seed: number } }): string {
  const bits = [`Seed ${part.config.seed}`];
  if (part.workers) bits.push(`${part.workers} worker${part.workers > 1 ? "s" : ""}`);
  if (part.wallMs !== undefined) bits.push(`${(part.wallMs / 1000).toFixed(2)} s in the browser`);
  return `${bits.join(" · ")}; summaries recomputed and spot-checked by the server when saved.`;
}

function isSavedStudy(v: unknown): v is SavedStudy {
  return !!v && typeof v === "object" && (v as { schema?: unknown }).schema === "railwise.study/1";
}

export function SavedStudyView({ study, hideWhenEmpty = false }: { study: unknown; hideWhenEmpty?: boolean }) {
  if (!isSavedStudy(study) || (!study.noiseMargin && !study.toleranceSpread)) {
    if (hideWhenEmpty) return null;
    return (
      <div data-testid="saved-studies">
        <Card title="Studies">
          <p className="text-[13px] text-ink-mute">
            No noise margin study or tolerance spread was saved with this run.
          </p>
        </Card>
      </div>
    );
  }
  return (
    <div className="grid gap-3" data-testid="saved-studies">
      {study.noiseMargin ? (
        <Card
          title="Noise margin study"
          description={`${study.noiseMargin.config.levels} levels × ${study.noiseMargin.config.seedsPerLevel} seeds, noise bandwidth ${study.noiseMargin.config.bandwidth} Hz`}
          className="min-w-0"
        >
          <NoiseMarginResult summary={study.noiseMargin.summary} meta={meta(study.noiseMargin)} />
        </Card>
      ) : null}
      {study.toleranceSpread ? (
        <Card
          title="Tolerance spread"
          description={`${study.toleranceSpread.config.draws.toLocaleString("en")} draws, ${study.toleranceSpread.config.distribution}: resistors ±${(study.toleranceSpread.config.resistorTolerance * 100).toFixed(1)} %, offset ±${(study.toleranceSpread.config.offsetTolerance * 1e3).toFixed(1)} mV, headroom ±${(study.toleranceSpread.config.headroomSpread * 100).toFixed(0)} %`}
          className="min-w-0"
        >
          <ToleranceSpreadResult summary={study.toleranceSpread.summary} meta={meta(study.toleranceSpread)} />
        </Card>
      ) : null}
    </div>
  );
}
