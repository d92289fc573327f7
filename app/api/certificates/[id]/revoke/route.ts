import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { isUuid, revokeCertificate } from "@/lib/server/services/certificates";
import { revokeCertificateSchema } from "@/lib/validation/claims";

export const POST = route<{ id: string }, typeof revokeCertificateSchema>(
  { permission: "certificate.revoke", body: revokeCertificateSchema },
  async ({ viewer, params, body }) => {
    if (!isUuid(params.id)) throw new AppError("not_found", "That certificate was not found.");
    return transaction((ctx) => revokeCertificate(ctx, { certificateId: params.id, actorId: viewer.id, reason: body.reason }));
  },
);
