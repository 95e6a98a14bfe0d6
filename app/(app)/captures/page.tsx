import type { Metadata } from "next";
import { CapturesView } from "@/components/captures/captures-view";
import { canEdit, requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Captures" };

export default async function CapturesPage() {
  const user = await requirePageUser();
  return <CapturesView canEdit={canEdit(user.role)} />;
}
