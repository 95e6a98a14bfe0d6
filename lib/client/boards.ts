// Boards: GET /api/boards and /api/boards/:id.
import useSWR from "swr";
import type { BoardJson, ListOf } from "@/lib/schemas/responses";
import { enc, get, quiet } from "./swr";

export type Board = BoardJson;

export const boardsKey = "/api/boards";
export const boardKey = (id: string) => `/api/boards/${enc(id)}`;

export const useBoards = () => useSWR<ListOf<Board>>(boardsKey, get, quiet);
export const useBoard = (id: string | null | undefined) => useSWR<Board>(id ? boardKey(id) : null, get);
