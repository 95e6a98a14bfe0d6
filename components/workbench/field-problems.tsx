"use client";
// Invalid fields, reported by each QuantityField to the workbench store while its text does not
// parse or breaks its rule. Run, Save, Save run, Apply and study runs refuse while any field in
// their scope is at fault, list those fields and move focus to the first one.
import { createContext, useContext, useEffect, type ReactNode } from "react";
import type { StoreApi } from "zustand";
import { listFieldProblems } from "@/lib/workbench/field-problems";
import type { FieldProblem, FieldScope, SideTab, WorkbenchState } from "./store";

interface Reporter {
  scope: FieldScope;
  tab: SideTab | null;
  report: (key: string, problem: FieldProblem | null) => void;
}

const FieldScopeContext = createContext<Reporter | null>(null);

/** Fields inside report their problems to `api` under `scope` (and the editor tab they sit on). */
export function FieldScopeProvider({
  api,
  scope,
  tab = null,
  children,
}: {
  api: StoreApi<WorkbenchState>;
  scope: FieldScope;
  tab?: SideTab | null;
  children: ReactNode;
}) {
  const value: Reporter = { scope, tab, report: (key, p) => api.getState().setFieldProblem(key, p) };
  return <FieldScopeContext.Provider value={value}>{children}</FieldScopeContext.Provider>;
}

/** Called by a field on every render: keeps its entry in the store in step with its message. */
export function useReportFieldProblem(key: string, label: string, message: string | null, inputId: string) {
  const ctx = useContext(FieldScopeContext);
  const scope = ctx?.scope;
  const tab = ctx?.tab ?? null;
  const report = ctx?.report;
  useEffect(() => {
    if (!report || !scope) return;
    report(key, message ? { label, message, inputId, scope, tab } : null);
  }, [report, scope, tab, key, label, message, inputId]);
  useEffect(() => () => report?.(key, null), [report, key]);
}

/**
 * When fields in `scopes` are at fault: show the list as an error notice, open the tab of the
 * first one and focus it, and answer true (the caller stops). `action` names what was refused.
 */
export function refuseIfInvalid(api: StoreApi<WorkbenchState>, scopes: FieldScope[], action: string): boolean {
  const st = api.getState();
  const all = Object.values(st.fieldProblems).filter((p) => scopes.includes(p.scope));
  if (!all.length) return false;
  const ordered = listFieldProblems(all, (id) =>
    typeof document === "undefined" ? null : document.getElementById(id),
  );
  st.setNotice({
    tone: "error",
    text: `${action} refused — fix ${ordered.length === 1 ? "this field" : "these fields"} first.`,
    fields: ordered,
  });
  const first = ordered[0];
  if (first.tab && first.tab !== st.tab) st.setTab(first.tab);
  // The tab switch re-renders first; focus once the field is visible.
  requestAnimationFrame(() => {
    const el = document.getElementById(first.inputId) as HTMLInputElement | null;
    el?.focus();
    el?.select?.();
  });
  return true;
}
