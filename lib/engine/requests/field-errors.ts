import type { z } from "zod";
import { EngineError } from "../engine-error";

/** Key used for an issue that belongs to the whole request rather than one field. */
export const ROOT_FIELD = "_";

/** One message per field, keyed by the dotted path the request used ("band.lowKHz", "profile.bands.0.ifKHz"). */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length === 0 ? ROOT_FIELD : issue.path.map((p) => String(p)).join(".");
    if (!(key in out)) out[key] = issue.message;
  }
  return out;
}

export type InvalidInputBody = {
  error: { code: "invalid_input"; message: string; fields: Record<string, string> };
};

function isZodError(e: unknown): e is z.ZodError {
  return e instanceof Error && e.name === "ZodError" && Array.isArray((e as { issues?: unknown }).issues);
}

/**
 * The 400 body for bad input, from either a schema failure or the engine's own refusal (a gang that
 * cannot cover the band, unrealisable tracking points). Anything else is not bad input: null.
 */
export function invalidInputBody(e: unknown, prefix = ""): InvalidInputBody | null {
  if (isZodError(e)) {
    const fields = fieldErrors(e);
    return { error: { code: "invalid_input", message: "Some fields need attention.", fields } };
  }
  if (e instanceof EngineError) {
    const key = e.field ? `${prefix}${e.field}` : ROOT_FIELD;
    return { error: { code: "invalid_input", message: e.message, fields: { [key]: e.message } } };
  }
  return null;
}
