import { z } from "@/lib/engine/zod";
import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/server/errors";
import { route } from "@/lib/server/route-handler";
import { deletePart, updatePart } from "@/lib/server/services/parts";
import { partUpdateSchema } from "@/lib/validation/parts";

// An id from the URL that is not a part's is simply not found.
function partIdFrom(params: { id: string }): string {
  const parsed = z.uuid().safeParse(params.id);
  if (!parsed.success) throw new AppError("not_found", "That part is not in the catalogue.");
  return parsed.data;
}

// PATCH edits any of name, supplierRef, cost, markupPercent, stock; { retired } retires or returns the part.
export const PATCH = route<{ id: string }, typeof partUpdateSchema>(
  { permission: "parts.manage", body: partUpdateSchema },
  async ({ params, body, viewer }) => {
    const id = partIdFrom(params);
    const part = await transaction((ctx) => updatePart(ctx, { id, input: body, actorId: viewer.id }));
    return { part };
  },
);

// DELETE removes a mistaken entry; a part any estimate or checklist rule uses is refused (409): retire it.
export const DELETE = route<{ id: string }>({ permission: "parts.manage" }, async ({ params, viewer }) => {
  const id = partIdFrom(params);
  return transaction((ctx) => deletePart(ctx, { id, actorId: viewer.id }));
});
