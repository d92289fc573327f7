import "server-only";
import { Server } from "node:net";
import { env } from "./env";

const LOOPBACK = /^(127\.\d+\.\d+\.\d+|::1|::ffff:127\.\d+\.\d+\.\d+)$/;

/** Addresses this process listens on that another machine could reach. */
function exposedListeners(): string[] {
  const handles = (process as unknown as { _getActiveHandles?: () => unknown[] })._getActiveHandles?.() ?? [];
  const out: string[] = [];
  for (const h of handles) {
    if (!(h instanceof Server) || !h.listening) continue;
    const addr = h.address();
    if (addr && typeof addr === "object" && !LOOPBACK.test(addr.address)) out.push(`${addr.address}:${addr.port}`);
  }
  return out;
}

/**
 * Run once when an app instance starts: the settings must be valid (env() names every problem), and the
 * local demo, whose stand-ins and mailbox page hand out sign-in links, must listen on loopback only.
 * Returns the reason to refuse the start, or null.
 */
export function startupProblem(): string | null {
  let local: boolean;
  try {
    local = env().BANDEDGE_LOCAL_DEMO;
  } catch (e) {
    return e instanceof Error ? e.message : String(e);
  }
  if (!local) return null;
  const exposed = exposedListeners();
  if (exposed.length)
    return `The local demo listens on loopback only (start it with --hostname 127.0.0.1); refusing to serve on ${exposed.join(", ")}.`;
  return null;
}
