// Fetch for the office's JSON routes: our error shape becomes an ApiError with its status, code and fields.
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = "ApiError";
  }
}

type ErrorBody = { error?: { code?: string; message?: string; fields?: Record<string, string> } };

export async function officeFetch<T>(url: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const headers = new Headers(init.headers);
  let body = init.body;
  if (init.json !== undefined) {
    headers.set("content-type", "application/json");
    body = JSON.stringify(init.json);
  }
  let res: Response;
  try {
    res = await fetch(url, { ...init, headers, body, credentials: "same-origin" });
  } catch {
    throw new ApiError(0, "network", "The shop's server could not be reached. Check the connection and try again; nothing was lost.");
  }
  const text = await res.text();
  let data: unknown = null;
  try {
    data = text ? JSON.parse(text) : null;
  } catch {
    data = null;
  }
  if (!res.ok) {
    const e = (data as ErrorBody | null)?.error;
    throw new ApiError(res.status, e?.code ?? "internal", e?.message ?? "Something went wrong on our side. Please try again.", e?.fields);
  }
  return data as T;
}
