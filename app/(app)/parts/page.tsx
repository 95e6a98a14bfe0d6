import type { Metadata } from "next";
import { PartsView } from "@/components/parts/parts-view";
import { canEdit, requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Part library" };

export default async function PartsPage() {
  const user = await requirePageUser();
  return <PartsView canEdit={canEdit(user.role)} />;
}
