import type { Metadata } from "next";
import { ReviewQueueView } from "@/components/review/review-queue";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Review queue" };

// Runs waiting on the signed-in member's decision, runs they asked others about, and decided runs.
export default async function ReviewQueuePage() {
  const user = await requirePageUser();
  return <ReviewQueueView role={user.role} />;
}
