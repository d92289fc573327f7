import { route } from "@/lib/server/route-handler";
import { createInstrument, listInstruments } from "@/lib/server/services/instruments";
import { instrumentCreateSchema } from "@/lib/validation/instruments";

// The instrument register, kept by whoever manages the shop's settings (others get 404).
export const GET = route({ permission: "instrument.manage" }, async () => ({ instruments: await listInstruments() }));

// A new instrument: its kind, maker and model as the shop writes them, serial and calibration dates.
export const POST = route({ permission: "instrument.manage", body: instrumentCreateSchema }, async ({ body, viewer }) => {
  const instrument = await createInstrument({ input: body, actorId: viewer.id });
  return { instrument };
});
