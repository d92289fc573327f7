import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { SESSION_ABSOLUTE_SECONDS } from "@/lib/server/auth";
import { DEMO, newCustomer } from "../support/accounts";
import { sql } from "../support/db";
import { TestClient } from "../support/http";
import { nextTestIp } from "../support/ip";
import { firstLink, listMail, waitForMail } from "../support/mail";

// Sign-in hardening: password hashing strength, the common-password list, answers that do not reveal
// which e-mails have accounts, session revocation, the absolute session lifetime, deactivation, and the
// database-backed limiter keyed on the trusted client-address header.

const ARGON2 = /^\$argon2id\$v=19\$m=(\d+),t=(\d+),p=(\d+)\$[A-Za-z0-9+/]+\$[A-Za-z0-9+/]+$/;

async function passwordHashOf(email: string): Promise<string> {
  const [row] = await sql<{ password: string }>(
    `select a.password from account a join "user" u on u.id = a.user_id where u.email = $1 and a.provider_id = 'credential'`,
    [email],
  );
  if (!row) throw new Error(`no credential account for ${email}`);
  return row.password;
}

function expectStrongArgon2(stored: string) {
  const m = ARGON2.exec(stored);
  expect(m, `not an argon2id PHC string: ${stored.slice(0, 40)}`).not.toBeNull();
  expect(Number(m![1])).toBeGreaterThanOrEqual(19456);
  expect(Number(m![2])).toBeGreaterThanOrEqual(2);
  expect(Number(m![3])).toBeGreaterThanOrEqual(1);
}

async function userIdOf(email: string): Promise<string> {
  const [row] = await sql<{ id: string }>(`select id from "user" where email = $1`, [email]);
  if (!row) throw new Error(`no user ${email}`);
  return row.id;
}

/** The reset token from the link in the "Choose a new password" mail sent after `after`. */
async function resetTokenFor(email: string, after: number): Promise<string> {
  const mail = await waitForMail(email, "Choose a new password", { after });
  const link = firstLink(mail, "reset-password");
  const m = /\/api\/auth\/reset-password\/([^/?#]+)/.exec(link);
  if (!m) throw new Error(`unexpected reset link ${link}`);
  return decodeURIComponent(m[1]!);
}

async function requestReset(email: string): Promise<{ status: number; body: unknown }> {
  const res = await new TestClient().post("/api/auth/request-password-reset", { email, redirectTo: "/reset-password" });
  return { status: res.status, body: await res.json() };
}

/** The session token behind a client's signed session cookie. */
function sessionTokenOf(client: TestClient): string {
  const m = /(?:^|; )(?:__Secure-)?better-auth\.session_token=([^;]+)/.exec(client.cookieHeader());
  if (!m) throw new Error("the client has no session cookie");
  return decodeURIComponent(m[1]!).split(".")[0]!;
}

/** Makes a session look `seconds` old while its sliding expiry stays days away (as for a session in daily use). */
async function ageSession(token: string, seconds: number): Promise<void> {
  const rows = await sql(
    "update session set created_at = now() - make_interval(secs => $2), expires_at = now() + interval '6 days' where token = $1 returning id",
    [token, seconds],
  );
  expect(rows, "session row to age").toHaveLength(1);
}

async function sessionCount(userId: string): Promise<number> {
  const [row] = await sql<{ n: number }>("select count(*)::int as n from session where user_id = $1", [userId]);
  return row!.n;
}

describe("password storage", () => {
  it("hashes a new account's password with argon2id at m ≥ 19456 KiB and t ≥ 2, and a reset password too", async () => {
    const { email } = await newCustomer("hash");
    const first = await passwordHashOf(email);
    expectStrongArgon2(first);

    const started = Date.now();
    expect((await requestReset(email)).status).toBe(200);
    const token = await resetTokenFor(email, started);
    const reset = await new TestClient().post("/api/auth/reset-password", { newPassword: "valve-glow-1948-reset", token });
    expect(reset.status).toBe(200);
    const after = await passwordHashOf(email);
    expectStrongArgon2(after);
    expect(after).not.toBe(first);
  });

  it("verifies the password exactly as typed (no trimming, no case folding)", async () => {
    const { email, password } = await newCustomer("exact");
    for (const variant of [` ${password}`, `${password} `, password.toUpperCase()]) {
      const res = await new TestClient().post("/api/auth/sign-in/email", { email, password: variant });
      expect(res.status, JSON.stringify(variant)).toBe(401);
    }
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password })).status).toBe(200);
  });
});

describe("the common-password list", () => {
  it("refuses the weakest passwords at sign-up, whatever their case or surrounding spaces, and creates no account", async () => {
    for (const weak of ["password", "12345678", "Password123", "QWERTYUIOP", " iloveyou ", "bandedge1"]) {
      const email = `weak-${randomUUID().slice(0, 8)}@example.com`;
      const res = await new TestClient().signUp("Weak Choice", email, weak);
      expect(res.status, weak).toBe(400);
      const body = (await res.json()) as { code?: string; message?: string };
      expect(body.code, weak).toBe("PASSWORD_TOO_COMMON");
      expect(body.message).toMatch(/commonly used/);
      expect(await sql(`select 1 from "user" where email = $1`, [email]), weak).toHaveLength(0);
    }
    // A password that is long enough and not on the list is accepted.
    const ok = await new TestClient().signUp("Fine Choice", `fine-${randomUUID().slice(0, 8)}@example.com`, "heptode-mixer-1937");
    expect(ok.status).toBe(200);
  });

  it("refuses them when a password is reset, and the reset link still works for a good password", async () => {
    const { email, password } = await newCustomer("weakreset");
    const started = Date.now();
    await requestReset(email);
    const token = await resetTokenFor(email, started);
    const before = await passwordHashOf(email);
    for (const weak of ["password123", "12345678", "Qwerty123"]) {
      const res = await new TestClient().post("/api/auth/reset-password", { newPassword: weak, token });
      expect(res.status, weak).toBe(400);
      expect(((await res.json()) as { code?: string }).code, weak).toBe("PASSWORD_TOO_COMMON");
    }
    expect(await passwordHashOf(email)).toBe(before);
    // The old password still signs in: nothing was changed by the refused attempts.
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password })).status).toBe(200);
    const good = await new TestClient().post("/api/auth/reset-password", { newPassword: "pentagrid-converter-9", token });
    expect(good.status).toBe(200);
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password: "pentagrid-converter-9" })).status).toBe(200);
  });
});

describe("answers that do not reveal which e-mails have accounts", () => {
  it("gives the same status and body for an unknown e-mail, a wrong password and an unconfirmed account's wrong password", async () => {
    const unconfirmed = `unconfirmed-${randomUUID().slice(0, 8)}@example.com`;
    expect((await new TestClient().signUp("Not Yet", unconfirmed, "regenerative-detector-3")).status).toBe(200);
    const attempts = [
      { email: `nobody-${randomUUID().slice(0, 8)}@example.com`, password: "whatever-long-enough" },
      { email: DEMO.customer.email, password: "not-the-password-at-all" },
      { email: DEMO.owner.email, password: "bench-owner-2025" },
      { email: unconfirmed, password: "not-the-password-at-all" },
    ];
    const answers = [];
    for (const a of attempts) {
      const res = await new TestClient().post("/api/auth/sign-in/email", a);
      answers.push({
        status: res.status,
        body: await res.json(),
        cookie: res.headers.getSetCookie().some((c) => c.includes("session_token=") && !/max-age=0/i.test(c)),
      });
    }
    expect(answers[0]!.status).toBe(401);
    expect(answers[0]!.cookie).toBe(false);
    for (const a of answers.slice(1)) expect(a).toEqual(answers[0]);
  });

  it("answers a password-reset request the same for a known and an unknown address, and mails only the known one", async () => {
    const { email } = await newCustomer("resetsame");
    const unknown = `nobody-${randomUUID().slice(0, 8)}@example.com`;
    const started = Date.now();
    const known = await requestReset(email);
    const stranger = await requestReset(unknown);
    expect(known.status).toBe(200);
    expect(stranger).toEqual(known);
    await waitForMail(email, "Choose a new password", { after: started });
    expect(await listMail(unknown)).toHaveLength(0);
  });

  it("answers a sign-up with an e-mail that already has an account like a new one, without touching the account", async () => {
    const { email, password } = await newCustomer("dupsignup");
    const before = await passwordHashOf(email);
    const fresh = await new TestClient().signUp("Someone", `fresh-${randomUUID().slice(0, 8)}@example.com`, "superhet-stage-4422");
    const dup = await new TestClient().signUp("Someone", email, "superhet-stage-4422");
    expect(dup.status).toBe(fresh.status);
    const shape = (b: { token?: unknown; user?: Record<string, unknown> }) => ({
      token: b.token,
      userKeys: Object.keys(b.user ?? {}).sort(),
    });
    expect(shape((await dup.json()) as never)).toEqual(shape((await fresh.json()) as never));
    expect(await passwordHashOf(email)).toBe(before);
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password })).status).toBe(200);
  });
});

describe("sessions", () => {
  it("revokes every session of the account when its password is reset", async () => {
    const { client: first, email, password } = await newCustomer("revoke");
    const second = new TestClient();
    await second.signIn(email, password);
    const userId = await userIdOf(email);
    expect((await first.get("/api/portal/jobs")).status).toBe(200);
    expect((await second.get("/api/portal/jobs")).status).toBe(200);
    expect(await sessionCount(userId)).toBeGreaterThanOrEqual(2);

    const started = Date.now();
    await requestReset(email);
    const token = await resetTokenFor(email, started);
    expect((await new TestClient().post("/api/auth/reset-password", { newPassword: "crystal-earpiece-1926", token })).status).toBe(200);

    expect(await sessionCount(userId)).toBe(0);
    for (const c of [first, second]) {
      expect((await c.get("/api/portal/jobs")).status).toBe(401);
      const page = await c.get("/portal");
      expect(page.status).toBeGreaterThanOrEqual(300);
      expect(page.status).toBeLessThan(400);
      expect(page.headers.get("location")).toContain("/sign-in");
      const session = await c.get("/api/auth/get-session");
      expect(await session.json()).toBeNull();
    }
    // The old password no longer works, the new one does; the used link cannot be used again.
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password })).status).toBe(401);
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password: "crystal-earpiece-1926" })).status).toBe(200);
    expect((await new TestClient().post("/api/auth/reset-password", { newPassword: "another-good-one-77", token })).status).toBe(400);
  });

  it("ends a session past the absolute lifetime at the next request, however active it was", async () => {
    const { client, email, password } = await newCustomer("absolute");
    const other = new TestClient();
    await other.signIn(email, password);
    expect((await client.get("/api/portal/jobs")).status).toBe(200);
    const aged = sessionTokenOf(client);
    const fresh = sessionTokenOf(other);
    // Just inside the lifetime: still fine (the sliding expiry is far away, as for a session in daily use).
    await ageSession(aged, SESSION_ABSOLUTE_SECONDS - 3600);
    expect((await client.get("/api/portal/jobs")).status).toBe(200);
    expect(await sql("select 1 from session where token = $1", [aged])).toHaveLength(1);

    // Past it by a minute: refused at the next request, and the row is gone; the other session is untouched.
    await ageSession(aged, SESSION_ABSOLUTE_SECONDS + 60);
    expect((await client.get("/api/portal/jobs")).status).toBe(401);
    expect(await sql("select 1 from session where token = $1", [aged])).toHaveLength(0);
    expect((await other.get("/api/portal/jobs")).status).toBe(200);
    expect(await sql("select 1 from session where token = $1", [fresh])).toHaveLength(1);
    const page = await client.get("/portal");
    expect(page.headers.get("location") ?? "").toContain("/sign-in");
  });

  it("does not let the sign-in service's own endpoints accept a session past the absolute lifetime", async () => {
    const { client, email, password } = await newCustomer("absolute-auth");
    const other = new TestClient();
    await other.signIn(email, password);
    const userId = await userIdOf(email);
    const before = (await (await other.get("/api/auth/get-session")).json()) as { user?: { email: string } } | null;
    expect(before?.user?.email).toBe(email);
    const tokens = [sessionTokenOf(client), sessionTokenOf(other)];
    for (const t of tokens) await ageSession(t, SESSION_ABSOLUTE_SECONDS + 60);

    // An account change with the aged cookie is refused and changes nothing.
    const change = await client.post("/api/auth/update-user", { name: "Taken Over" });
    expect(change.status).toBe(401);
    const [u] = await sql<{ name: string }>(`select name from "user" where id = $1`, [userId]);
    expect(u!.name).not.toBe("Taken Over");
    // The session endpoint does not hand the aged session out either.
    expect(await (await other.get("/api/auth/get-session")).json()).toBeNull();
    for (const t of tokens) expect(await sql("select 1 from session where token = $1", [t])).toHaveLength(0);
  });
});

describe("a deactivated account", () => {
  it("is cut off at its next request and cannot sign in again", async () => {
    const { email, password } = await newCustomer("deactivated");
    const userId = await userIdOf(email);
    // Made a technician as the office does it (role changed, sessions ended), then signed in again.
    await sql(`update "user" set role = 'technician', updated_at = now() where id = $1`, [userId]);
    await sql("delete from session where user_id = $1", [userId]);
    const tech = new TestClient();
    await tech.signIn(email, password);
    expect((await tech.get("/api/bench/staff")).status).toBe(200);

    // A ban flag alone (sessions left in place) already stops the existing session.
    await sql(`update "user" set banned = true where id = $1`, [userId]);
    expect((await tech.get("/api/bench/staff")).status).toBe(401);
    expect((await tech.get("/bench")).headers.get("location") ?? "").toContain("/sign-in");

    // What the office's "Deactivate" does (setUserActive): banned with a reason, every session deleted.
    await sql(`update "user" set banned = true, ban_reason = 'Deactivated by the shop owner', updated_at = now() where id = $1`, [userId]);
    await sql("delete from session where user_id = $1", [userId]);
    const again = await new TestClient().post("/api/auth/sign-in/email", { email, password });
    expect(again.status).toBeGreaterThanOrEqual(400);
    expect(again.status).toBeLessThan(500);
    expect(again.headers.getSetCookie().some((c) => c.includes("session_token=") && !/max-age=0/i.test(c))).toBe(false);
    expect(await sessionCount(userId)).toBe(0);
    expect((await tech.get("/api/bench/staff")).status).toBe(401);

    // Reactivated, the same password works again (nothing else was lost).
    await sql(`update "user" set banned = false, ban_reason = null where id = $1`, [userId]);
    const back = new TestClient();
    await back.signIn(email, password);
    expect((await back.get("/api/bench/staff")).status).toBe(200);
  });
});

describe("the sign-in limiter", () => {
  // An account of its own: the per-account failure throttle must not lock a demo account other tests use.
  let target: { email: string; password: string };
  beforeAll(async () => {
    const made = await newCustomer("limiter");
    target = { email: made.email, password: made.password };
  });
  const ipA = nextTestIp();
  const ipB = nextTestIp();

  async function counter(ip: string, path = "/sign-in/email") {
    const rows = await sql<{ count: number; last_request: string }>("select count, last_request from rate_limit where key = $1", [
      `${ip}|${path}`,
    ]);
    return rows[0] ? { count: rows[0].count, lastRequest: Number(rows[0].last_request) } : null;
  }

  it("keeps its counters in the database, one per trusted client address", async () => {
    await sql("delete from rate_limit where key in ($1, $2)", [`${ipA}|/sign-in/email`, `${ipB}|/sign-in/email`]);
    const before = Date.now();
    for (let i = 0; i < 3; i++) {
      const res = await new TestClient({ ip: ipA }).post("/api/auth/sign-in/email", {
        email: target.email,
        password: `wrong-${i}-password`,
      });
      expect(res.status).toBe(401);
    }
    const res = await new TestClient({ ip: ipB }).post("/api/auth/sign-in/email", {
      email: target.email,
      password: "wrong-b-password",
    });
    expect(res.status).toBe(401);
    const a = await counter(ipA);
    const b = await counter(ipB);
    expect(a?.count).toBe(3);
    expect(b?.count).toBe(1);
    expect(a!.lastRequest).toBeGreaterThanOrEqual(before - 5_000);
  });

  it("counts two values of the trusted header separately: one address is refused, the other is not", async () => {
    let refusedAt = -1;
    for (let i = 0; i < 10 && refusedAt < 0; i++) {
      const res = await new TestClient({ ip: ipA }).post("/api/auth/sign-in/email", {
        email: target.email,
        password: `wrong-more-${i}`,
      });
      if (res.status === 429) refusedAt = i;
      else expect(res.status).toBe(401);
    }
    expect(refusedAt).toBeGreaterThanOrEqual(0);
    // Even the right password is refused from the throttled address for the rest of the window.
    expect((await new TestClient({ ip: ipA }).post("/api/auth/sign-in/email", target)).status).toBe(429);
    // The other address still has its own allowance left.
    expect((await new TestClient({ ip: ipB }).post("/api/auth/sign-in/email", target)).status).toBe(200);
    expect((await counter(ipB))?.count).toBe(2);
  });

  it("honours a counter written by another instance: the state lives in the shared table, not in memory", async () => {
    const ip = nextTestIp();
    await sql("delete from rate_limit where key = $1", [`${ip}|/sign-in/email`]);
    // What another app instance would have written after a burst from this address.
    await sql("insert into rate_limit (id, key, count, last_request) values ($1, $2, 1000, $3)", [
      randomUUID(),
      `${ip}|/sign-in/email`,
      Date.now(),
    ]);
    expect((await new TestClient({ ip }).post("/api/auth/sign-in/email", target)).status).toBe(429);
    // An old counter (outside the window) does not hold anyone back.
    await sql("update rate_limit set last_request = $2 where key = $1", [`${ip}|/sign-in/email`, Date.now() - 3_600_000]);
    expect((await new TestClient({ ip }).post("/api/auth/sign-in/email", target)).status).toBe(200);
    expect((await counter(ip))?.count).toBe(1);
  });

  it("throttles sign-up and reset requests per address as well", async () => {
    const ip = nextTestIp();
    const statuses: number[] = [];
    for (let i = 0; i < 8; i++) {
      const res = await new TestClient({ ip }).post("/api/auth/request-password-reset", {
        email: `nobody-${i}-${randomUUID().slice(0, 6)}@example.com`,
        redirectTo: "/reset-password",
      });
      statuses.push(res.status);
    }
    expect(statuses[0]).toBe(200);
    expect(statuses).toContain(429);
    expect((await counter(ip, "/request-password-reset"))?.count).toBeGreaterThanOrEqual(1);
  });
});

describe("the session check on every request", () => {
  function sessionCookie(client: TestClient): { name: string; token: string; signature: string } {
    const m = /(?:^|; )((?:__Secure-)?better-auth\.session_token)=([^;]+)/.exec(client.cookieHeader());
    if (!m) throw new Error("the client has no session cookie");
    const value = decodeURIComponent(m[2]!);
    const dot = value.lastIndexOf(".");
    return { name: m[1]!, token: value.slice(0, dot), signature: value.slice(dot + 1) };
  }

  it("refuses a session cookie the app did not sign, on routes and pages", async () => {
    const { client } = await newCustomer("tampered");
    const other = await newCustomer("tampered-other");
    expect((await client.get("/api/portal/jobs")).status).toBe(200);
    const mine = sessionCookie(client);
    const theirs = sessionCookie(other.client);
    const flipped = (mine.signature[0] === "A" ? "B" : "A") + mine.signature.slice(1);
    const forged = [
      `${mine.token}.${flipped}`, // signature altered
      `${theirs.token}.${mine.signature}`, // another live session's token under this signature
      mine.token, // no signature at all
      `${mine.token}.`,
      `${mine.token}.${mine.signature}x`,
    ];
    for (const value of forged) {
      const cookie = `${mine.name}=${encodeURIComponent(value)}`;
      const api = await new TestClient().get("/api/portal/jobs", { headers: { cookie } });
      expect(api.status, value).toBe(401);
      const page = await new TestClient().get("/portal", { headers: { cookie } });
      expect(page.headers.get("location") ?? "", value).toContain("/sign-in");
    }
    // Both real sessions still work.
    expect((await client.get("/api/portal/jobs")).status).toBe(200);
    expect((await other.client.get("/api/portal/jobs")).status).toBe(200);
  });

  it("extends a session due for its sliding refresh and ends one that has expired", async () => {
    const { client } = await newCustomer("sliding");
    const { token } = sessionCookie(client);
    // Last extended two days ago (the refresh is due once a day): the next request extends it by the full week.
    await sql("update session set expires_at = now() + interval '5 days' where token = $1", [token]);
    expect((await client.get("/api/portal/jobs")).status).toBe(200);
    const [row] = await sql<{ days: string }>(
      "select extract(epoch from expires_at - now()) / 86400 as days from session where token = $1",
      [token],
    );
    expect(Number(row!.days)).toBeGreaterThan(6.9);
    // A request well inside the day after a refresh leaves the expiry alone.
    const [before] = await sql<{ e: Date }>("select expires_at as e from session where token = $1", [token]);
    expect((await client.get("/api/portal/jobs")).status).toBe(200);
    const [after] = await sql<{ e: Date }>("select expires_at as e from session where token = $1", [token]);
    expect(after!.e.getTime()).toBe(before!.e.getTime());
    // Past its expiry: refused, and the row is removed.
    await sql("update session set expires_at = now() - interval '1 minute' where token = $1", [token]);
    expect((await client.get("/api/portal/jobs")).status).toBe(401);
    expect(await sql("select 1 from session where token = $1", [token])).toHaveLength(0);
  });
});

describe("the client address behind the proxy", () => {
  // X-Forwarded-For is a list the client starts and each proxy appends to (RFC 7239 §5.2 describes the same
  // chain for Forwarded); the test stack runs with one trusted proxy hop, whose entry is the last one.
  // Each client gets an address no other test uses, so no earlier throttled address is met by chance.
  const real = () => nextTestIp();
  const spoofed = (i: number) => `198.18.${i}.${1 + Math.floor(Math.random() * 250)}`;

  it("counts a client by the address the proxy appended, however it varies its own header", async () => {
    const attacker = real();
    const { email } = await newCustomer("spoof");
    const statuses: number[] = [];
    for (let i = 0; i < 12; i++) {
      const res = await new TestClient({ ip: `${spoofed(i)}, ${attacker}` }).post("/api/auth/sign-in/email", {
        email,
        password: `wrong-guess-${i}`,
      });
      statuses.push(res.status);
    }
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401]);
    expect(
      statuses.slice(5).every((s) => s === 429),
      statuses.join(","),
    ).toBe(true);
    const [row] = await sql<{ count: number }>("select count from rate_limit where key = $1", [`${attacker}|/sign-in/email`]);
    expect(row?.count).toBeGreaterThanOrEqual(5);
    // Someone else behind the same proxy, whose own software also sent the header, is not held back.
    const other = await new TestClient({ ip: `${spoofed(99)}, ${real()}` }).post("/api/auth/sign-in/email", DEMO.customer2);
    expect(other.status).toBe(200);
  });

  it("throttles failed sign-ins per e-mail from any address, and answers an unknown e-mail the same way", async () => {
    const { email, password } = await newCustomer("account-throttle");
    const unknown = `nobody-${randomUUID().slice(0, 8)}@example.com`;
    const run = async (target: string) => {
      const out: { status: number; body: unknown }[] = [];
      for (let i = 0; i < 12; i++) {
        // A fresh address for every attempt, as from many machines.
        const res = await new TestClient({ ip: real() }).post("/api/auth/sign-in/email", { email: target, password: `wrong-${i}-guess` });
        out.push({ status: res.status, body: await res.json() });
      }
      return out;
    };
    const known = await run(email);
    const stranger = await run(unknown);
    expect(known.map((a) => a.status)).toEqual([...Array(10).fill(401), 429, 429]);
    expect(stranger).toEqual(known);
    // Even the right password waits out the window, so the refusal reveals nothing about it.
    expect((await new TestClient({ ip: real() }).post("/api/auth/sign-in/email", { email, password })).status).toBe(429);
    // Another account is unaffected.
    expect((await new TestClient({ ip: real() }).post("/api/auth/sign-in/email", DEMO.customer2)).status).toBe(200);
  });
});

describe("server-side limits on every field of the sign-in service", () => {
  it("refuses an over-long name at sign-up, in an account change and from the owner's admin call, naming the field", async () => {
    const email = `longname-${randomUUID().slice(0, 8)}@example.com`;
    const huge = "N".repeat(200_000);
    const signUp = await new TestClient().signUp(huge, email, "superhet-stage-4422");
    expect(signUp.status).toBe(400);
    expect(((await signUp.json()) as { message: string }).message).toBe("name: use at most 120 characters.");
    expect(await sql(`select 1 from "user" where email = $1`, [email])).toHaveLength(0);
    // 120 characters, the limit the sign-up form shows, are accepted.
    expect((await new TestClient().signUp("N".repeat(120), email, "superhet-stage-4422")).status).toBe(200);

    const { client, email: mine } = await newCustomer("longname-update");
    const change = await client.post("/api/auth/update-user", { name: "M".repeat(121) });
    expect(change.status).toBe(400);
    const [row] = await sql<{ name: string }>(`select name from "user" where email = $1`, [mine]);
    expect(row!.name.length).toBeLessThanOrEqual(120);

    const owner = new TestClient();
    await owner.signIn(DEMO.owner.email, DEMO.owner.password);
    const id = await userIdOf(mine);
    const admin = await owner.post("/api/auth/admin/update-user", { userId: id, data: { name: "A".repeat(5000) } });
    expect(admin.status).toBe(400);
    const blank = await new TestClient().signUp("   ", `blank-${randomUUID().slice(0, 8)}@example.com`, "superhet-stage-4422");
    expect(blank.status).toBe(400);
  });

  it("refuses over-long e-mails and unknown fields' long values", async () => {
    const long = `${"a".repeat(300)}@example.com`;
    expect((await new TestClient().signUp("Fine Name", long, "superhet-stage-4422")).status).toBe(400);
    const res = await new TestClient().post("/api/auth/sign-up/email", {
      name: "Fine Name",
      email: `extra-${randomUUID().slice(0, 8)}@example.com`,
      password: "superhet-stage-4422",
      image: `https://example.com/${"x".repeat(5000)}`,
    });
    expect(res.status).toBe(400);
  });
});

describe("the audit log of sign-in events and the owner's account administration", () => {
  async function auditRows(action: string, since: Date) {
    return sql<{ actor_id: string | null; entity: string; entity_id: string; after: Record<string, unknown> | null }>(
      "select actor_id, entity, entity_id, after from audit_event where action = $1 and at >= $2 order by id",
      [action, since],
    );
  }

  it("records sign-in, failed sign-in, sign-out and password reset, without the password or the reset token", async () => {
    const since = new Date(Date.now() - 1000);
    const { client, email, password } = await newCustomer("audited");
    const id = await userIdOf(email);
    const wrong = "definitely-wrong-secret-77";
    expect((await new TestClient().post("/api/auth/sign-in/email", { email, password: wrong })).status).toBe(401);
    expect((await client.post("/api/auth/sign-out", {})).status).toBe(200);

    const started = Date.now();
    await requestReset(email);
    const token = await resetTokenFor(email, started);
    const newPassword = "crystal-earpiece-2207";
    expect((await new TestClient().post("/api/auth/reset-password", { newPassword, token })).status).toBe(200);

    expect((await auditRows("auth.sign_in", since)).some((r) => r.actor_id === id && r.entity_id === id)).toBe(true);
    const failed = await auditRows("auth.sign_in_failed", since);
    expect(failed.length).toBeGreaterThanOrEqual(1);
    expect((await auditRows("auth.sign_out", since)).some((r) => r.actor_id === id)).toBe(true);
    expect((await auditRows("auth.password_reset_requested", since)).length).toBeGreaterThanOrEqual(1);
    expect((await auditRows("auth.password_reset", since)).some((r) => r.entity_id === id)).toBe(true);

    const all = JSON.stringify(await sql("select * from audit_event where at >= $1", [since]));
    for (const secret of [password, wrong, newPassword, token]) expect(all).not.toContain(secret);
  });

  it("records the owner's calls to the admin endpoints with who did what to whom, and no password", async () => {
    const since = new Date(Date.now() - 1000);
    const owner = new TestClient();
    await owner.signIn(DEMO.owner.email, DEMO.owner.password);
    const ownerId = await userIdOf(DEMO.owner.email);
    const newPassword = "bench-created-5521";
    const created = await owner.post("/api/auth/admin/create-user", {
      email: `made-${randomUUID().slice(0, 8)}@example.com`,
      password: newPassword,
      name: "Made By Owner",
      role: "customer",
    });
    expect(created.status).toBe(200);
    const targetId = ((await created.json()) as { user: { id: string } }).user.id;
    for (const [path, body] of [
      ["/api/auth/admin/update-user", { userId: targetId, data: { name: "Renamed By Owner" } }],
      ["/api/auth/admin/set-role", { userId: targetId, role: "technician" }],
      ["/api/auth/admin/ban-user", { userId: targetId, banReason: "Left the shop" }],
      ["/api/auth/admin/unban-user", { userId: targetId }],
    ] as const) {
      expect((await owner.post(path, body)).status, path).toBe(200);
    }
    for (const action of ["create-user", "update-user", "set-role", "ban-user", "unban-user"]) {
      const rows = await auditRows(`auth.admin.${action}`, since);
      expect(rows, action).toHaveLength(1);
      expect(rows[0]!.actor_id).toBe(ownerId);
      expect(rows[0]!.entity_id).toBe(targetId);
    }
    const all = JSON.stringify(await sql("select * from audit_event where at >= $1", [since]));
    expect(all).not.toContain(newPassword);
    expect(all).toContain("Left the shop");
  });
});
