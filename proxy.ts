import { NextResponse, type NextRequest } from "next/server";

// Runs before routing. It only turns away addresses that cannot be decoded (a broken percent-escape),
// which would otherwise surface as a server error; authorization is never decided here.
export function proxy(request: NextRequest) {
  try {
    decodeURIComponent(request.nextUrl.pathname);
  } catch {
    return new NextResponse("This address is not valid.", { status: 400, headers: { "content-type": "text/plain; charset=utf-8" } });
  }
  return NextResponse.next();
}

export const config = { matcher: "/((?!_next/static|_next/image).*)" };
