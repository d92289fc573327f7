import { fileURLToPath } from "node:url";
import { ESLint } from "eslint";
import { beforeAll, describe, expect, it } from "vitest";

// The floors of the house are kept by the linter (eslint.config.mjs). Each case lints a deliberately
// wrong import as if it sat in the named file, and one allowed import as a control, so a rule that
// stopped resolving paths (and so reported nothing) fails here too.

const root = fileURLToPath(new URL("../..", import.meta.url));
let eslint: ESLint;

beforeAll(() => {
  eslint = new ESLint({ cwd: root });
});

async function findings(filePath: string, code: string): Promise<string[]> {
  const [result] = await eslint.lintText(code, { filePath });
  return result.messages.map((m) => `${m.ruleId}: ${m.message}`);
}

const layerRule = /no-restricted-(paths|imports|properties)/;

// Loading ESLint with its plugins takes seconds on a busy machine; the findings themselves are quick.
describe("import boundaries", { timeout: 60_000 }, () => {
  it("reports the engine importing the database client", async () => {
    const found = await findings("lib/engine/alignment/wrong.ts", 'import { db } from "@/db";\nexport const x = db;\n');
    expect(found.some((f) => f.startsWith("import/no-restricted-paths") && f.includes("engine is pure"))).toBe(true);
  });

  it("reports the engine importing a framework or reading the environment", async () => {
    const found = await findings(
      "lib/engine/pricing/wrong.ts",
      'import { headers } from "next/headers";\nexport const h = headers;\nexport const k = process.env.SECRET;\n',
    );
    expect(found.filter((f) => layerRule.test(f))).toHaveLength(2);
  });

  it("reports the engine reaching out through a relative path", async () => {
    const found = await findings(
      "lib/engine/pricing/wrong.ts",
      'import { AppError } from "../../server/errors";\nexport const e = AppError;\n',
    );
    expect(found.some((f) => f.startsWith("import/no-restricted-paths"))).toBe(true);
  });

  it("allows the engine its own files (control)", async () => {
    const found = await findings(
      "lib/engine/pricing/fine.ts",
      'import { EngineError } from "../engine-error";\nexport const e = EngineError;\n',
    );
    expect(found.filter((f) => layerRule.test(f))).toEqual([]);
  });

  it("reports a component importing a route's private folder", async () => {
    const found = await findings(
      "components/warranty/wrong.tsx",
      'import { api } from "@/app/(portal)/portal/_lib/api";\nexport const a = api;\n',
    );
    expect(found.some((f) => f.startsWith("import/no-restricted-paths"))).toBe(true);
  });

  it("reports a component loading server code, and allows a server type", async () => {
    const value = await findings(
      "components/bench/wrong.tsx",
      'import { getViewer } from "@/lib/server/session";\nexport const v = getViewer;\n',
    );
    expect(value.some((f) => f.startsWith("@typescript-eslint/no-restricted-imports"))).toBe(true);
    const typeOnly = await findings(
      "components/bench/fine.tsx",
      'import type { Viewer } from "@/lib/server/session";\nexport type V = Viewer;\n',
    );
    expect(typeOnly.filter((f) => layerRule.test(f))).toEqual([]);
  });

  it("reports db reaching up into validation and the server", async () => {
    const found = await findings(
      "db/queries/wrong.ts",
      'import { queueQuerySchema } from "@/lib/validation/bench";\nimport { audit } from "@/lib/server/audit";\nexport const x = [queueQuerySchema, audit];\n',
    );
    expect(found.filter((f) => f.startsWith("import/no-restricted-paths"))).toHaveLength(2);
  });

  it("reports server code importing a route", async () => {
    const found = await findings("lib/server/services/wrong.ts", 'import { GET } from "@/app/api/health/route";\nexport const g = GET;\n');
    expect(found.some((f) => f.startsWith("import/no-restricted-paths"))).toBe(true);
  });
});
