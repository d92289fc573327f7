// The app's database role. PostgreSQL's privilege system (documentation, "Privileges" and GRANT) refuses
// a statement the role holds no privilege for with SQLSTATE 42501, insufficient_privilege; a table's
// structure can be changed only by its owner. Those are the outside facts checked here.
import pg from "pg";
import { afterAll, describe, expect, it } from "vitest";
import { testEnv } from "../support/env";

const app = new pg.Pool({ connectionString: testEnv.databaseUrl, max: 2 });
afterAll(() => app.end());

/** Runs one statement in a transaction that is always rolled back; answers the SQLSTATE of a refusal, or "ok". */
async function attempt(statement: string, values: unknown[] = []): Promise<string> {
  const client = await app.connect();
  try {
    await client.query("begin");
    await client.query(statement, values);
    return "ok";
  } catch (e) {
    return (e as { code?: string }).code ?? String(e);
  } finally {
    await client.query("rollback").catch(() => undefined);
    client.release();
  }
}

describe("the role the app connects as", () => {
  it("is neither a superuser nor the owner of the tables", async () => {
    const { rows } = await app.query<{ role: string; superuser: boolean; owns: number }>(
      `select current_user as role, r.rolsuper as superuser,
              (select count(*)::int from pg_tables where schemaname = 'public' and tableowner = current_user) as owns
       from pg_roles r where r.rolname = current_user`,
    );
    expect(rows[0]).toMatchObject({ superuser: false, owns: 0 });
    expect(rows[0]!.role).not.toBe("postgres");
  });

  it("may add to the audit log and read it, but an UPDATE or DELETE on it is refused", async () => {
    const [{ n: before }] = (await app.query<{ n: number }>("select count(*)::int as n from audit_event")).rows as [{ n: number }];
    expect(before).toBeGreaterThan(0);
    expect(
      await attempt(
        "insert into audit_event (actor_id, action, entity, entity_id, before, after) values (null, 'probe.insert', 'probe', 'p1', null, null)",
      ),
    ).toBe("ok");
    expect(await attempt("update audit_event set action = 'rewritten' where id = (select min(id) from audit_event)")).toBe("42501");
    expect(await attempt("delete from audit_event where id = (select min(id) from audit_event)")).toBe("42501");
    expect(await attempt("truncate audit_event")).toBe("42501");
    const [{ n: after }] = (await app.query<{ n: number }>("select count(*)::int as n from audit_event")).rows as [{ n: number }];
    expect(after).toBeGreaterThanOrEqual(before);
  });

  it("cannot change the structure of the app's tables or make new ones", async () => {
    expect(await attempt("alter table audit_event disable trigger all")).toBe("42501");
    expect(await attempt("drop table audit_event")).toBe("42501");
    expect(await attempt("create table public.intruder (id int)")).toBe("42501");
    expect(await attempt("create schema intruder")).toBe("42501");
  });

  it("works the rows the app needs", async () => {
    expect(await attempt("update job set symptoms = symptoms where false")).toBe("ok");
    expect(await attempt("delete from session where false")).toBe("ok");
    // The queue lives in a schema of its own that the app role may use.
    expect(await attempt("select count(*) from pgboss.job")).toBe("ok");
  });
});
