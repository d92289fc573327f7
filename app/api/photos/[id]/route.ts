import { getPhotoForViewer } from "@/db/queries/photos";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { can } from "@/lib/engine/permissions";
import { photoStore } from "@/lib/server/uploads/storage";
import { idFrom } from "../../portal/_lib/ids";

// GET /api/photos/:id[?size=thumb] — the re-encoded photo, for its owner and for the workshop only.
export const GET = route<{ id: string }>({ permission: "photo.view" }, async ({ viewer, params, request }) => {
  const photo = await getPhotoForViewer({
    photoId: idFrom(params.id, "That photo"),
    viewerId: viewer.id,
    staff: can(viewer.role, "bench.use"),
  });
  if (!photo) throw new AppError("not_found", "That photo was not found.");
  const thumb = new URL(request.url).searchParams.get("size") === "thumb";
  const key = thumb && photo.thumbKey ? photo.thumbKey : photo.storageKey;
  const bytes = await photoStore().get(key);
  if (!bytes) throw new AppError("not_found", "That photo was not found.");
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": photo.mime,
      "content-length": String(bytes.length),
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
      "content-disposition": "inline",
    },
  });
});
