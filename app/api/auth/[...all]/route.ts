import { toNextJsHandler } from "better-auth/next-js";
import { auth } from "@/lib/server/auth";
import { endSessionPastLifetime } from "@/lib/server/session";

export async function GET(request: Request) {
  await endSessionPastLifetime(request.headers);
  return toNextJsHandler(auth()).GET(request);
}

export async function POST(request: Request) {
  await endSessionPastLifetime(request.headers);
  return toNextJsHandler(auth()).POST(request);
}
