// Set by scripts/test.mjs for every test process.
function need(name: string): string {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set: run the tests through npm test`);
  return v;
}

export const testEnv = {
  get appUrl() {
    return need("APP_URL");
  },
  get mailUrl() {
    return need("MAILBOX_URL");
  },
  get databaseUrl() {
    return need("DATABASE_URL");
  },
  /** The owner role's connection (migrations, backups); the app's own connection is databaseUrl. */
  get ownerDatabaseUrl() {
    return need("DATABASE_OWNER_URL");
  },
  get chromium() {
    return process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";
  },
  get artifacts() {
    return process.env.TEST_ARTIFACTS ?? "test-results";
  },
  get stripeUrl() {
    return need("STRIPE_API_BASE");
  },
  get webhookSecret() {
    return need("STRIPE_WEBHOOK_SECRET");
  },
};
