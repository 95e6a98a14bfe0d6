import type { Metadata } from "next";
import { BoardView } from "@/components/boards/board-view";
import { canEdit, requirePageUser } from "@/lib/server/session";
import { requireTeamItemOr404 } from "@/lib/server/session";

export const metadata: Metadata = { title: "Board" };

export default async function BoardPage({ params }: { params: Promise<{ id: string }> }) {
  const [{ id }, user] = await Promise.all([params, requirePageUser()]);
  await requireTeamItemOr404("board", id, user.teamId);
  return <BoardView boardId={id} canEdit={canEdit(user.role)} />;
}
