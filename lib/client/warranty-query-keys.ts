// One query-key factory for the warranty domain; mutations invalidate exactly the keys they change.
export const warrantyKeys = {
  all: ["warranty"] as const,
  myClaims: () => [...warrantyKeys.all, "my-claims"] as const,
};

export type ApiError = { code: string; message: string; fields?: Record<string, string> };

export class ApiFailure extends Error {
  constructor(readonly error: ApiError) {
    super(error.message);
  }
}

/** JSON POST to our own API; a structured error becomes an ApiFailure with its field messages. */
export async function postJson<T>(path: string, body: unknown): Promise<T> {
  const res = await fetch(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  const data = (await res.json().catch(() => null)) as ({ error?: ApiError } & T) | null;
  if (!res.ok) throw new ApiFailure(data?.error ?? { code: "internal", message: "That did not work. Please try again." });
  return data as T;
}
