import "server-only";
import { deleteUnattachedUpload, listUnattachedUploads } from "@/db/queries/photos";
import { TICKET_TTL_MS } from "./photos";
import { photoStore } from "./storage";

/**
 * An upload nothing refers to is abandoned once its ticket can no longer be used (a day), plus an hour so a
 * form sent in the ticket's last minute is never swept from under it.
 */
export const ABANDONED_AFTER_MS = TICKET_TTL_MS + 3600 * 1000;
const BATCH = 100;

/**
 * Removes uploads never attached to a quote, message, claim or counter intake: the files from the store first,
 * then the row, so a store that is down leaves the row for the next round. Safe on several instances at once
 * (deleting a file twice is harmless; the row goes once).
 */
export async function sweepUnattachedUploads(now = Date.now()): Promise<number> {
  const rows = await listUnattachedUploads({ before: new Date(now - ABANDONED_AFTER_MS), limit: BATCH });
  let removed = 0;
  for (const row of rows) {
    await photoStore().remove(row.thumbKey ? [row.key, row.thumbKey] : [row.key]);
    if (await deleteUnattachedUpload({ key: row.key })) removed++;
  }
  return removed;
}
