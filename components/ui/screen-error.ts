// A failed request in the words of the screen: a 400's zod issues name the fields by the labels
// the panels show (lib/workbench/screen-words.ts), other failures keep the server's message.
import { HttpError, errorMessage } from "@/lib/client/fetcher";
import { apiIssuesText } from "@/lib/workbench/screen-words";

export function screenError(e: unknown): string {
  return (e instanceof HttpError && apiIssuesText(e.body)) || errorMessage(e);
}
