import { drizzle } from "drizzle-orm/node-postgres";
import { migrate } from "drizzle-orm/node-postgres/migrator";
import { Pool } from "pg";
import PgBoss from "pg-boss";

// Applies the committed migrations in db/migrations; safe to run on every start. Migrations run as the owner
// role (DATABASE_OWNER_URL) when one is configured; then the app role (DATABASE_APP_ROLE) is granted only what
// it needs: rows of the app's tables, never their structure, and the audit table insert-and-read only.
const APP_GRANTS = (role: string) => `
grant usage on schema public to ${role};
grant select, insert, update, delete on all tables in schema public to ${role};
grant usage, select on all sequences in schema public to ${role};
revoke update, delete, truncate on table audit_event from ${role};
`;

async function main() {
  const url = process.env.DATABASE_OWNER_URL ?? process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set");
  const pool = new Pool({ connectionString: url, max: 1 });
  try {
    await migrate(drizzle(pool), { migrationsFolder: "db/migrations" });
    console.log("migrations applied");
    const appRole = process.env.DATABASE_APP_ROLE;
    if (appRole) {
      if (!/^[a-z_][a-z0-9_]*$/.test(appRole)) throw new Error("DATABASE_APP_ROLE must be a plain lower-case role name");
      await pool.query(APP_GRANTS(appRole));
      console.log(`rights of ${appRole} set`);
    }
  } finally {
    await pool.end();
  }
  if (process.env.DATABASE_OWNER_URL && process.env.DATABASE_URL) await installQueue(process.env.DATABASE_URL);
}

// The queue's tables are made by the app role in the schema it owns (pgboss, created with the roles). The
// library's own install would first try CREATE SCHEMA, which needs a right on the whole database the app
// role does not have, so its plan runs here without that statement.
async function installQueue(appUrl: string) {
  const pool = new Pool({ connectionString: appUrl, max: 1 });
  try {
    const { rows } = await pool.query<{ t: string | null }>("select to_regclass('pgboss.version')::text as t");
    if (rows[0]?.t) return;
    await pool.query(PgBoss.getConstructionPlans("pgboss").replace(/CREATE SCHEMA IF NOT EXISTS pgboss\s*;/i, ""));
    console.log("queue tables created");
  } finally {
    await pool.end();
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
