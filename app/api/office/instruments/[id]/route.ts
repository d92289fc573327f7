import { transaction } from "@/db/transaction";
import { AppError } from "@/lib/server/errors";
import { route } from "@/lib/server/route-handler";
import { deleteInstrument, updateInstrument } from "@/lib/server/services/instruments";
import { instrumentUpdateSchema } from "@/lib/validation/instruments";

import { z } from "@/lib/engine/zod";

// An id from the URL that is not an instrument's is simply not found.
function instrumentIdFrom(params: { id: string }): string {
  const parsed = z.uuid().safeParse(params.id);
  if (!parsed.success) throw new AppError("not_found", "That instrument is not in the register.");
  return parsed.data;
}

// PATCH { retired } retires an instrument or returns it to service; { calibratedOn, calibrationDueOn } records a new calibration.
export const PATCH = route<{ id: string }, typeof instrumentUpdateSchema>(
  { permission: "instrument.manage", body: instrumentUpdateSchema },
  async ({ params, body, viewer }) => {
    const id = instrumentIdFrom(params);
    const instrument = await transaction((ctx) => updateInstrument(ctx, { id, input: body, actorId: viewer.id }));
    return { instrument };
  },
);

// DELETE removes a mistaken entry; an instrument any reading names is refused (409) and stays for history.
export const DELETE = route<{ id: string }>({ permission: "instrument.manage" }, async ({ params, viewer }) => {
  const id = instrumentIdFrom(params);
  return transaction((ctx) => deleteInstrument(ctx, { id, actorId: viewer.id }));
});
