import { assertSameOrigin, errorResponse, json, readJson, zodFields } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { acceptStaffInvitation } from "@/lib/server/services/staff-invitations";
import { staffInvitationAcceptSchema } from "@/lib/validation/account";

// No session: the single-use invitation token is the credential. Only the owner's invite action makes one.
export async function POST(request: Request) {
  try {
    assertSameOrigin(request);
    const parsed = staffInvitationAcceptSchema.safeParse(await readJson(request, 4096));
    if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
    await acceptStaffInvitation(parsed.data);
    return json({ ok: true });
  } catch (error) {
    return errorResponse(error);
  }
}
