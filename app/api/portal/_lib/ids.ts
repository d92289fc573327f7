import { z } from "@/lib/engine/zod";
import { AppError } from "@/lib/server/errors";

const uuid = z.uuid();

// An id from the URL that is not one of ours is simply not found.
export function idFrom(value: string, what = "That job"): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw new AppError("not_found", `${what} was not found.`);
  return parsed.data;
}
