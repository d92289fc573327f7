import "server-only";
import { BlockList, isIP } from "node:net";
import { env } from "./env";

/**
 * The header the app itself sets on requests it hands to the sign-in service, carrying the address
 * worked out below. Any copy a client sends is removed first.
 */
export const CLIENT_ADDRESS_HEADER = "x-bandedge-client-address";

function normalise(raw: string): string | null {
  let ip = raw.trim();
  // "[2001:db8::1]:443" and "192.0.2.1:443" as some proxies write them.
  const bracketed = /^\[([^\]]+)\](?::\d+)?$/.exec(ip);
  if (bracketed) ip = bracketed[1]!;
  else if (/^\d+\.\d+\.\d+\.\d+:\d+$/.test(ip)) ip = ip.slice(0, ip.lastIndexOf(":"));
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(ip);
  if (mapped) ip = mapped[1]!;
  return isIP(ip) ? ip.toLowerCase() : null;
}

let trusted: { list: BlockList; size: number } | undefined;
function trustedProxies(): { list: BlockList; size: number } {
  if (trusted) return trusted;
  const list = new BlockList();
  let size = 0;
  for (const entry of env().TRUSTED_PROXIES) {
    const [addr, prefix] = entry.split("/");
    const family = isIP(addr!) === 6 ? "ipv6" : "ipv4";
    if (prefix === undefined) list.addAddress(addr!, family);
    else list.addSubnet(addr!, Number(prefix), family);
    size++;
  }
  trusted = { list, size };
  return trusted;
}

function isTrustedProxy(ip: string): boolean {
  return trustedProxies().list.check(ip, isIP(ip) === 6 ? "ipv6" : "ipv4");
}

/**
 * The client's address, for throttling and the audit log. X-Forwarded-For (or the header named by
 * TRUSTED_IP_HEADER) is a list the client starts and each proxy appends to, so only the entries our own
 * proxies appended can be believed:
 *  - TRUSTED_PROXIES (addresses or CIDR ranges): walking from the right, the first entry that is not one of
 *    our proxies is the client;
 *  - TRUSTED_PROXY_HOPS = n: the n-th entry from the right, the one the outermost of our n proxies wrote;
 *  - neither: the header is the client's own claim and is ignored (null: callers use one shared bucket).
 * The app cannot see the connection's own peer address, so it must be reachable only through those proxies.
 */
export function clientAddress(h: Headers): string | null {
  const e = env();
  const { size } = trustedProxies();
  if (size === 0 && e.TRUSTED_PROXY_HOPS === 0) return null;
  const entries = (h.get(e.TRUSTED_IP_HEADER) ?? "")
    .split(",")
    .map((p) => p.trim())
    .filter(Boolean);
  if (size > 0) {
    for (let i = entries.length - 1; i >= 0; i--) {
      const ip = normalise(entries[i]!);
      if (!ip) return null;
      if (!isTrustedProxy(ip)) return ip;
    }
    return null;
  }
  if (entries.length < e.TRUSTED_PROXY_HOPS) return null;
  return normalise(entries[entries.length - e.TRUSTED_PROXY_HOPS]!);
}

/** The key for per-address counters: the client address, or one shared bucket when it cannot be known. */
export function clientAddressKey(h: Headers): string {
  return clientAddress(h) ?? "unknown";
}
