"use client";

import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { FormDialog } from "@/components/ui/dialog";
import { EmptyState } from "@/components/ui/empty-state";
import { Field, TextArea, TextInput } from "@/components/ui/field";
import { formatRelative } from "@/components/ui/format";
import { LoadError, LoadingRows } from "@/components/ui/load-state";
import { PageHeader } from "@/components/ui/page-header";
import { useToast } from "@/components/ui/toast";
import { errorMessage, sendJson } from "@/lib/client/fetcher";
import { useBoards, type Board } from "@/lib/client/hooks";

export interface BoardsViewProps {
  teamName: string;
  /** Only the owner creates boards (DEVELOPERS.md § Roles). */
  canCreate: boolean;
}

export function BoardsView({ teamName, canCreate }: BoardsViewProps) {
  const { data, error, isLoading, mutate } = useBoards();
  const [creating, setCreating] = useState(false);
  const boards = data?.items ?? [];

  return (
    <>
      <PageHeader
        eyebrow={teamName}
        title="Boards"
        description="One board per product or PCB; each holds the scenarios of its op-amp stages."
        actions={
          canCreate && (
            <Button variant="primary" onClick={() => setCreating(true)}>
              New board
            </Button>
          )
        }
      />
      {error ? (
        <LoadError message={errorMessage(error)} onRetry={() => void mutate()} />
      ) : isLoading ? (
        <div className="rounded-lg border border-paper-line bg-paper-card">
          <LoadingRows />
        </div>
      ) : boards.length === 0 ? (
        <div className="rounded-lg border border-paper-line bg-paper-card">
          <EmptyState
            title="No boards yet"
            action={
              canCreate && (
                <Button variant="primary" onClick={() => setCreating(true)}>
                  New board
                </Button>
              )
            }
          >
            {canCreate ? "Create a board for the product you are designing." : "Your team owner creates boards."}
          </EmptyState>
        </div>
      ) : (
        <ul className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3" data-testid="board-list">
          {boards.map((b) => (
            <li key={b.id}>
              <BoardTile board={b} />
            </li>
          ))}
        </ul>
      )}
      {canCreate && (
        <NewBoardDialog
          open={creating}
          onClose={() => setCreating(false)}
          onCreated={() => {
            setCreating(false);
            void mutate();
          }}
        />
      )}
    </>
  );
}

function BoardTile({ board }: { board: Board }) {
  return (
    <Link
      href={`/boards/${board.id}`}
      className="group flex h-full flex-col rounded-lg border border-paper-line bg-paper-card p-4 transition-colors hover:border-copper/50"
    >
      <span className="font-semibold text-ink group-hover:text-copper-deep">{board.name}</span>
      {board.description ? (
        <span className="mt-1 line-clamp-2 text-[13px] text-ink-mute">{board.description}</span>
      ) : (
        <span className="mt-1 text-[13px] text-ink-faint">No description</span>
      )}
      <span className="mt-auto flex gap-4 pt-3 text-[12px] text-ink-mute">
        {board.scenarioCount !== undefined && (
          <span>
            <span className="font-mono text-ink-soft">{board.scenarioCount}</span> scenario
            {board.scenarioCount === 1 ? "" : "s"}
          </span>
        )}
        {board.updatedAt && <span>updated {formatRelative(board.updatedAt)}</span>}
      </span>
    </Link>
  );
}

function NewBoardDialog({ open, onClose, onCreated }: { open: boolean; onClose: () => void; onCreated: () => void }) {
  const toast = useToast();
  const [name, setName] = useState("");
  const [description, setDescription] = useState("");

  async function create() {
    const trimmed = name.trim();
    if (!trimmed) throw new Error("Name: give the board a name.");
    await sendJson<Board>("/api/boards", "POST", { name: trimmed, description: description.trim() });
    toast.notify(`Board “${trimmed}” created`, "success");
    setName("");
    setDescription("");
    onCreated();
  }

  return (
    <FormDialog
      open={open}
      onClose={onClose}
      title="New board"
      description="A design folder for one product or PCB."
      submitLabel="Create board"
      busyLabel="Creating…"
      onSubmit={create}
    >
      <Field label="Name" htmlFor="board-name">
        <TextInput id="board-name" value={name} onChange={(e) => setName(e.target.value)} maxLength={120} autoFocus />
      </Field>
      <Field label="Description" htmlFor="board-description" hint="Optional: what the board does and where it goes.">
        <TextArea
          id="board-description"
          value={description}
          onChange={(e) => setDescription(e.target.value)}
          maxLength={2000}
          rows={3}
        />
      </Field>
    </FormDialog>
  );
}
