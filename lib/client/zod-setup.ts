import { config } from "zod/v4/core";

// The Content Security Policy allows no eval: zod's compiled fast path would try `new Function` (and be
// refused, logging a violation) before falling back. Parse without it everywhere in the browser.
config({ jitless: true });

// Any check without a message of its own names its field and what is allowed, never zod's default phrasing.
import "@/lib/validation/field-words";
