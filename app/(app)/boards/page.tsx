import type { Metadata } from "next";
import { BoardsView } from "@/components/boards/boards-view";
import { requirePageUser } from "@/lib/server/session";

export const metadata: Metadata = { title: "Boards" };

export default async function BoardsPage() {
  const user = await requirePageUser();
  return <BoardsView teamName={user.teamName} canCreate={user.role === "owner"} />;
}
