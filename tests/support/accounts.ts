import { randomUUID } from "node:crypto";
import { TestClient } from "./http";
import { firstLink, waitForMail } from "./mail";

export const DEMO = {
  owner: { email: "odile@kestrel-lane.example", password: "bench-owner-2026" },
  tech: { email: "tomas@kestrel-lane.example", password: "bench-tech-2026" },
  tech2: { email: "priya@kestrel-lane.example", password: "bench-tech-2026" },
  customer: { email: "mira.holloway@example.com", password: "demo-owner-2026" },
  customer2: { email: "jonah.pell@example.com", password: "demo-owner-2026" },
} as const;

export async function signedIn(who: { email: string; password: string }): Promise<TestClient> {
  const client = new TestClient();
  await client.signIn(who.email, who.password);
  return client;
}

// A brand-new verified customer, created through the real sign-up and e-mail link.
export async function newCustomer(label = "owner"): Promise<{ client: TestClient; email: string; password: string; name: string }> {
  const email = `${label}-${randomUUID().slice(0, 8)}@example.com`;
  const password = `tuning-fork-${randomUUID().slice(0, 6)}`;
  const name = `Test ${label}`;
  const client = new TestClient();
  const res = await client.signUp(name, email, password);
  if (!res.ok) throw new Error(`sign-up failed: ${res.status} ${await res.text()}`);
  const mail = await waitForMail(email, "Confirm your e-mail");
  await client.follow(firstLink(mail, "verify-email"));
  await client.signIn(email, password);
  return { client, email, password, name };
}
