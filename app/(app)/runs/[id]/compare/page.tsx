import type { Metadata } from "next";
import { CompareView } from "@/components/review/compare-view";
import { requireTeamItemOr404 } from "@/lib/server/session";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Compare runs" };

// Two runs overlaid: this one and ?with= (default: the previous run of the same scenario).
export default async function CompareRunsPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ with?: string | string[] }>;
}) {
  const { id } = await params;
  await requireTeamItemOr404("run", id, (await requirePageUser()).teamId);
  const sp = await searchParams;
  const withId = typeof sp.with === "string" && sp.with ? sp.with : null;
  return <CompareView runId={id} withId={withId} />;
}
