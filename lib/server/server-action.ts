import "server-only";
import type { z } from "zod";
import { zodFields } from "./route-handler";
import { AppError, toAppError } from "./errors";
import { canAccess, type Permission } from "@/lib/engine/permissions";
import { getViewer, type Viewer } from "./session";

export type ActionResult<T> =
  { ok: true; data: T } | { ok: false; error: { code: string; message: string; fields?: Record<string, string> } };

// The one wrapper for server actions: resolves the session, checks the permission, parses input.
export function action<S extends z.ZodType, T>(permission: Permission, schema: S, fn: (input: z.infer<S>, viewer: Viewer) => Promise<T>) {
  return async (raw: unknown): Promise<ActionResult<T>> => {
    try {
      const viewer = await getViewer();
      if (!viewer) throw new AppError("unauthenticated", "Please sign in again.");
      if (!canAccess(viewer, permission)) throw new AppError("not_found", "Not found.");
      const parsed = schema.safeParse(raw);
      if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
      return { ok: true, data: await fn(parsed.data, viewer) };
    } catch (error) {
      const e = toAppError(error);
      return { ok: false, error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}) } };
    }
  };
}
