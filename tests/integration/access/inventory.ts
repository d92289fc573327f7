import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative, sep } from "node:path";

const APP = join(process.cwd(), "app");

function walk(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) walk(p, out);
    else if (/\.(ts|tsx)$/.test(name)) out.push(p);
  }
  return out;
}

// Turns app/(group)/api/x/[id]/route.ts into /api/x/[id]: route groups do not appear in URLs.
function urlOf(file: string): string {
  const parts = relative(APP, file)
    .split(sep)
    .slice(0, -1)
    .filter((s) => !(s.startsWith("(") && s.endsWith(")")));
  return "/" + parts.join("/");
}

export function routeInventory(): { method: string; route: string; file: string }[] {
  const out: { method: string; route: string; file: string }[] = [];
  for (const file of walk(APP).filter((f) => /route\.tsx?$/.test(f))) {
    const text = readFileSync(file, "utf8");
    for (const m of text.matchAll(/export\s+(?:async\s+)?(?:function|const)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) {
      out.push({ method: m[1]!, route: urlOf(file), file });
    }
    // Re-exported handlers (export const { GET, POST } = …)
    const destructured = /export\s+const\s*\{([^}]+)\}\s*=/.exec(text);
    if (destructured)
      for (const name of destructured[1]!.split(",").map((s) => s.trim().split(":")[0]!.trim()))
        if (/^(GET|POST|PUT|PATCH|DELETE)$/.test(name)) out.push({ method: name, route: urlOf(file), file });
  }
  return out;
}

export function actionInventory(): { file: string; name: string; wrappedWith: string | null }[] {
  const out: { file: string; name: string; wrappedWith: string | null }[] = [];
  for (const file of walk(APP).concat(walk(join(process.cwd(), "lib")), walk(join(process.cwd(), "components")))) {
    const text = readFileSync(file, "utf8");
    if (!/^\s*["']use server["']/m.test(text)) continue;
    for (const m of text.matchAll(/export\s+(?:const|async\s+function|function)\s+(\w+)/g)) {
      const wrapped = new RegExp(`export\\s+const\\s+${m[1]}\\s*=\\s*action\\(\\s*"([\\w.]+)"`).exec(text);
      out.push({ file: relative(process.cwd(), file), name: m[1]!, wrappedWith: wrapped ? wrapped[1]! : null });
    }
  }
  return out;
}

/** Every page (page.tsx) under app/, development pages included, as its URL. */
export function pageInventory(): { route: string; file: string }[] {
  return walk(APP)
    .filter((f) => /[/\\]page\.tsx?$/.test(f))
    .map((file) => ({ route: urlOf(file), file: relative(process.cwd(), file) }));
}
