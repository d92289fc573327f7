import { toNextJsHandler } from "better-auth/next-js";
import { databaseReachable } from "@/db";
import { auth } from "@/lib/server/auth";
import { AppError, databaseUnavailable } from "@/lib/server/errors";
import { errorResponse } from "@/lib/server/route-handler";
import { endSessionPastLifetime } from "@/lib/server/session";

// The auth library answers its own failures with an empty 500; people get a JSON answer that says what
// happened instead: 503 with Retry-After when the database is not answering, a plain message otherwise.
async function guarded(request: Request, handle: (request: Request) => Promise<Response>): Promise<Response> {
  let response: Response;
  try {
    await endSessionPastLifetime(request.headers);
    response = await handle(request);
  } catch (error) {
    if (!(await databaseReachable())) return errorResponse(databaseUnavailable());
    return errorResponse(error);
  }
  if (response.status < 500) return response;
  if (!(await databaseReachable())) return errorResponse(databaseUnavailable());
  if (response.headers.get("content-type")?.includes("json")) return response;
  return errorResponse(new AppError("internal", "Something went wrong on our side. Please try again."));
}

export async function GET(request: Request) {
  return guarded(request, toNextJsHandler(auth()).GET);
}

export async function POST(request: Request) {
  return guarded(request, toNextJsHandler(auth()).POST);
}
