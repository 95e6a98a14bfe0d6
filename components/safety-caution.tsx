// The caution DEVELOPERS.md (§ Safety caution) asks for on stages that switch heaters, motors, pumps or mains.
import { cx } from "@/components/ui/cx";

export const SAFETY_CAUTION_TEXT =
  "Behavioural simulation is no substitute for bench tests; mains wiring, isolation, fusing and relay ratings " +
  "follow local electrical codes and licensed practice.";

// Words that mean the stage's output ends up switching a load (common practice, no source).
const LOAD_WORDS =
  /\b(heaters?|heating|motors?|pumps?|bilge|fans?|mains|relays?|contactors?|solenoids?|disconnect|cut-?off|thermostats?|compressors?|valves?)\b/i;

/** True when a scenario's name or notes suggest it drives a load (battery disconnect, heater, pump, fan, mains, relay…). */
export function suggestsLoadSwitching(...texts: Array<string | null | undefined>): boolean {
  return texts.some((t) => typeof t === "string" && LOAD_WORDS.test(t));
}

export interface SafetyCautionProps {
  /** Show or hide explicitly; when omitted, decided from `texts`. */
  show?: boolean;
  /** Name, notes, board name… scanned for load words when `show` is not given. */
  texts?: Array<string | null | undefined>;
  className?: string;
}

export function SafetyCaution({ show, texts = [], className }: SafetyCautionProps) {
  const visible = show ?? suggestsLoadSwitching(...texts);
  if (!visible) return null;
  return (
    <aside
      role="note"
      aria-label="Safety caution"
      data-testid="safety-caution"
      className={cx(
        "flex gap-3 rounded-md border border-caution/40 bg-caution-soft px-3.5 py-2.5 text-[13px] text-ink",
        className,
      )}
    >
      <svg aria-hidden width="18" height="18" viewBox="0 0 20 20" className="mt-0.5 shrink-0 text-caution">
        <path d="M10 2 L19 18 H1 Z" fill="none" stroke="currentColor" strokeWidth="1.8" strokeLinejoin="round" />
        <path d="M10 8 V12.5 M10 14.8 V15" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
      </svg>
      <p>
        <span className="font-semibold text-caution">Switching a heater, motor, pump or mains?</span>{" "}
        {SAFETY_CAUTION_TEXT}
      </p>
    </aside>
  );
}
