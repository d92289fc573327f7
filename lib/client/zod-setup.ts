// The browser's zod settings: no eval (lib/engine/zod.ts, which every schema module imports first), and the
// field words for any check without a message of its own, never zod's default phrasing.
import "@/lib/engine/zod";
import "@/lib/validation/field-words";
