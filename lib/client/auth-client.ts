import { adminClient } from "better-auth/client/plugins";
import { createAuthClient } from "better-auth/react";

// Same-origin client: the base URL is the page's own origin.
export const authClient = createAuthClient({ plugins: [adminClient()] });
