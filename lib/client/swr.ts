// What every SWR hook of lib/client shares: the JSON fetcher (throws HttpError on non-2xx) and the
// quiet setting. Keys are the API URLs, so after a write `mutate(url)` (exact key, swr#746) or
// the hook's bound `mutate` refreshes the view. Answer types come from lib/schemas/responses.ts.
import type { SWRConfiguration } from "swr";
import { fetchJson } from "./fetcher";

export const get = <T>(url: string) => fetchJson<T>(url);

/** Lists stay quiet on focus: engineers switch windows a lot and a reflowing table is noise. */
export const quiet: SWRConfiguration = { revalidateOnFocus: false };

export const enc = encodeURIComponent;
