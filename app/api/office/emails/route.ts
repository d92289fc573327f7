import { listFailedEmailsForOffice } from "@/db/queries/office";
import { route } from "@/lib/server/route-handler";

// E-mail the provider would not take (or that ran out of tries), newest first, with the reason.
export const GET = route({ permission: "email.resend" }, async () => ({ rows: await listFailedEmailsForOffice() }));
