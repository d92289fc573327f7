import { assertSameOrigin, errorResponse, json, readJson, zodFields } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { acceptStaffInvitation } from "@/lib/server/services/staff-invitations";
import { staffInvitationAcceptSchema } from "@/lib/validation/account";

// No session: the single-use invitation token is the credential. Made by the owner's staff invite and by counter intake.
export async function POST(request: Request) {
  try {
    assertSameOrigin(request);
    const parsed = staffInvitationAcceptSchema.safeParse(await readJson(request, 4096));
    if (!parsed.success) throw new AppError("invalid_input", "Some fields need attention.", zodFields(parsed.error));
    const { role } = await acceptStaffInvitation(parsed.data);
    return json({ ok: true, role: role === "customer" ? "customer" : "staff" });
  } catch (error) {
    return errorResponse(error);
  }
}
