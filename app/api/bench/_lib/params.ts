import { z } from "@/lib/engine/zod";
import { AppError } from "@/lib/server/errors";

const uuid = z.uuid();

// Ids come from the URL: anything that is not a job id is simply not found.
export async function jobIdFrom(params: { id: string }): Promise<string> {
  const parsed = uuid.safeParse(params.id);
  if (!parsed.success) throw new AppError("not_found", "That job was not found.");
  return parsed.data;
}
