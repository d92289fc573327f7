import { config } from "zod/v4/core";

// The Content Security Policy allows no eval: zod's compiled fast path would try `new Function` (and be
// refused, logging a violation) before falling back. Parse without it everywhere in the browser.
config({ jitless: true });
