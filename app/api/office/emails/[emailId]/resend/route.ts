import { z } from "@/lib/engine/zod";
import { json, route } from "@/lib/server/route-handler";
import { AppError, notFound } from "@/lib/server/errors";
import { getOutboxRowForOffice } from "@/db/queries/office";
import { resendFailedEmail } from "@/lib/server/mail";

// Puts a failed message back in the queue with fresh tries (202: queued, not sent yet).
export const POST = route<{ emailId: string }>({ permission: "email.resend" }, async ({ params, viewer }) => {
  if (!z.uuid().safeParse(params.emailId).success) throw notFound("That message");
  const row = await getOutboxRowForOffice({ outboxId: params.emailId });
  if (!row) throw notFound("That message");
  if (!(await resendFailedEmail(row.id, viewer.id)))
    throw new AppError("conflict", "Only a message that failed can be sent again; this one is already queued or sent.");
  return json({ id: row.id, status: "queued" }, { status: 202 });
});
