import { transaction } from "@/db/transaction";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { isUuid, reissueCertificate } from "@/lib/server/services/certificates";
import { reissueCertificateSchema } from "@/lib/validation/claims";

export const POST = route<{ id: string }, typeof reissueCertificateSchema>(
  { permission: "certificate.reissue", body: reissueCertificateSchema },
  async ({ viewer, params, body }) => {
    if (!isUuid(params.id)) throw new AppError("not_found", "That certificate was not found.");
    return transaction((ctx) => reissueCertificate(ctx, { certificateId: params.id, actorId: viewer.id, reason: body.reason }));
  },
);
