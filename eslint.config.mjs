// Lint and layer rules. `npm run lint` runs ESLint (Next's rules and typescript-eslint) and Prettier;
// `npm test` runs it first and fails on any finding. The floors of the house, from the top:
//
//   app        → components, lib/client, lib/validation, lib/server, db, lib/engine, emails
//   components → components, lib/client, lib/validation, lib/engine (and types only from lib/server, db)
//   lib/client → lib/validation, lib/engine          (browser-side: auth client, API clients, query keys)
//   lib/server → lib/server, db, emails, lib/validation, lib/engine
//   emails     → emails, lib/engine
//   db         → db, lib/engine                      (db/index.ts also reads lib/server/env.ts)
//   lib/validation → lib/validation, lib/engine
//   lib/engine → lib/engine only, and no framework, database, environment or server-only module
import { defineConfig, globalIgnores } from "eslint/config";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";
import prettier from "eslint-config-prettier/flat";

const OURS = [
  "./app",
  "./components",
  "./db",
  "./emails",
  "./lib/server",
  "./lib/client",
  "./lib/validation",
  "./lib/engine",
  "./scripts",
  "./tests",
];
const except = (...allowed) => OURS.filter((p) => !allowed.includes(p));

/** One zone per floor: files in `target` may not import anything in `from`. */
const zone = (target, from, message) => ({ target, from, message });

const LAYER_ZONES = [
  zone("./lib/engine", except("./lib/engine"), "The engine is pure: it imports nothing of ours from outside lib/engine."),
  zone(
    "./lib/validation",
    except("./lib/validation", "./lib/engine"),
    "Validation schemas read only the engine, so forms and the server can both load them.",
  ),
  zone(
    "./lib/client",
    except("./lib/client", "./lib/validation", "./lib/engine"),
    "Browser-side helpers read only validation and the engine.",
  ),
  // components may take *types* from the server and db (they describe what a page hands them); see below.
  zone(
    "./components",
    ["./app", "./emails", "./scripts", "./tests"],
    "Components are shared below the routes: app imports components, never the other way round.",
  ),
  zone("./emails", except("./emails", "./lib/engine"), "E-mail templates render what they are given; they read only the engine."),
  zone(
    "./lib/server",
    ["./app", "./components", "./lib/client", "./scripts", "./tests"],
    "Server code sits below the routes and the components.",
  ),
  zone(
    ["./db/queries", "./db/schema", "./db/transaction.ts", "./db/migrations"],
    except("./db", "./lib/engine"),
    "db reads only its own files and engine types.",
  ),
  {
    target: "./db/index.ts",
    from: "./lib/server",
    except: ["./env.ts"],
    message: "The database client is built from the typed environment (lib/server/env.ts) and nothing else of the server's.",
  },
  zone("./db/index.ts", except("./db", "./lib/engine", "./lib/server"), "db reads only its own files and engine types."),
  zone("./app", ["./scripts", "./tests"], "Routes never import scripts or tests."),
];

// Packages the pure engine may not load: frameworks, the database, the environment's adapters.
const ENGINE_FORBIDDEN_PACKAGES = [
  "next",
  "next/*",
  "react",
  "react-dom",
  "react/*",
  "server-only",
  "client-only",
  "drizzle-orm",
  "drizzle-orm/*",
  "pg",
  "pg-boss",
  "better-auth",
  "better-auth/*",
  "stripe",
  "resend",
  "uploadthing",
  "uploadthing/*",
  "@uploadthing/*",
  "@react-pdf/*",
  "@react-email/*",
  "sharp",
];

export default defineConfig([
  ...nextVitals,
  ...nextTs,
  prettier,
  globalIgnores([
    ".next/**",
    ".next-*/**",
    ".bandedge/**",
    "node_modules/**",
    "test-results/**",
    "coverage/**",
    "db/migrations/**",
    "next-env.d.ts",
  ]),
  {
    settings: { "import/resolver": { typescript: { project: "./tsconfig.json" }, node: true } },
    rules: {
      "import/no-restricted-paths": ["error", { zones: LAYER_ZONES }],
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
    },
  },
  {
    files: ["lib/engine/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            { group: ENGINE_FORBIDDEN_PACKAGES, message: "The engine is pure TypeScript: no framework, database or server-only module." },
          ],
        },
      ],
      "no-restricted-properties": [
        "error",
        {
          object: "process",
          property: "env",
          message: "The engine takes its figures as arguments; lib/server/env.ts reads the environment.",
        },
      ],
    },
  },
  {
    files: ["components/**"],
    rules: {
      // Types erase at build: a type from a server module describes the props a page hands over and
      // cannot pull server code into the browser bundle. Value imports stay forbidden.
      "@typescript-eslint/no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["@/lib/server/*", "@/lib/server/**", "**/lib/server/**"],
              allowTypeImports: true,
              message: "Components run in the browser too: take server data as props.",
            },
            {
              group: ["@/db", "@/db/*", "@/db/**", "**/db/**"],
              allowTypeImports: true,
              message: "Components never reach the database: take data as props.",
            },
          ],
        },
      ],
    },
  },
  {
    files: ["components/**", "app/**"],
    ignores: ["app/api/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          paths: [
            {
              name: "@hookform/resolvers/zod",
              message: "Use @/lib/client/zod-resolver: it applies the browser's zod settings (no eval, field words) first.",
            },
          ],
        },
      ],
    },
  },
  {
    files: ["lib/client/**", "lib/validation/**"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          patterns: [
            {
              group: ["server-only", "next/headers", "drizzle-orm", "drizzle-orm/*", "pg"],
              message: "Loaded by the browser: no server-only module.",
            },
          ],
        },
      ],
    },
  },
  {
    // Schemas are built from lib/engine/zod.ts, which sets zod's browser mode (no eval) before any schema exists.
    files: ["app/**", "components/**", "lib/**", "db/**", "emails/**"],
    ignores: ["lib/engine/zod.ts"],
    rules: {
      "no-restricted-syntax": [
        "error",
        {
          selector: "ImportDeclaration[source.value=/^zod($|\\u002F)/][importKind!='type']",
          message: "Import z from @/lib/engine/zod (or ./zod inside the engine): it sets zod's browser mode first.",
        },
      ],
    },
  },
  {
    files: ["scripts/**", "tests/**", "*.config.*", "*.mjs"],
    rules: { "import/no-anonymous-default-export": "off" },
  },
]);
