// Every schema in Bandedge is built from this module's `z`, never from "zod" directly.
//
// In the browser, zod would probe `new Function` (its compiled fast path) as soon as the first object schema is
// created, and the Content Security Policy (no eval) reports that probe as a violation even though zod
// catches it. Each schema module imports this one first, so the setting below is made before any schema exists
// on the page. On the server the compiled fast path stays on.
import { z } from "zod";
import { config } from "zod/v4/core";

if (typeof window !== "undefined") config({ jitless: true });

export { z };
