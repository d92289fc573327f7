import { getPhotoForViewer } from "@/db/queries/photos";
import { route } from "@/lib/server/route-handler";
import { AppError } from "@/lib/server/errors";
import { can } from "@/lib/engine/permissions";
import { PHOTO_STORE_DOWN_MESSAGE, PhotoStoreUnavailable, photoStore } from "@/lib/server/uploads/storage";
import { idFrom } from "../../portal/_lib/ids";

// GET /api/photos/:id[?size=thumb] — the re-encoded photo, for its owner and for the workshop only. The bytes
// are fetched from the store with a short-lived signed URL and streamed through, so that URL never reaches
// the browser; a store that is down or slow answers 503 with Retry-After.
export const GET = route<{ id: string }>({ permission: "photo.view" }, async ({ viewer, params, request }) => {
  const photo = await getPhotoForViewer({
    photoId: idFrom(params.id, "That photo"),
    viewerId: viewer.id,
    staff: can(viewer.role, "bench.use"),
  });
  if (!photo) throw new AppError("not_found", "That photo was not found.");
  const thumb = new URL(request.url).searchParams.get("size") === "thumb";
  const key = thumb && photo.thumbKey ? photo.thumbKey : photo.storageKey;
  let found: Awaited<ReturnType<ReturnType<typeof photoStore>["open"]>>;
  try {
    found = await photoStore().open(key);
  } catch (e) {
    if (!(e instanceof PhotoStoreUnavailable)) throw e;
    console.error("[bandedge] photo store unavailable", e.message, e.cause);
    throw new AppError("unavailable", PHOTO_STORE_DOWN_MESSAGE);
  }
  if (!found) throw new AppError("not_found", "That photo was not found.");
  return new Response(found.body, {
    headers: {
      "content-type": photo.mime,
      ...(found.size !== null ? { "content-length": String(found.size) } : {}),
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
      "content-disposition": "inline",
    },
  });
});
