import type { Metadata } from "next";
import { BoardView } from "@/components/boards/board-view";
import { canEdit, requirePageUser } from "@/lib/page-session";

export const metadata: Metadata = { title: "Board" };

export default async function BoardPage({ params }: { params: Promise<{ id: string }> }) {
  const [{ id }, user] = await Promise.all([params, requirePageUser()]);
  return <BoardView boardId={id} canEdit={canEdit(user.role)} />;
}
