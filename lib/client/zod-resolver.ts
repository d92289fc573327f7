// The form resolver every client form uses, with the browser's zod settings (no eval, field words) applied
// first. Pages without a form do not load zod at all.
import "./zod-setup";

export { zodResolver } from "@hookform/resolvers/zod";
