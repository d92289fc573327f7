import { EngineError } from "../engine-error";

export type JsonValue = null | boolean | number | string | JsonValue[] | { [key: string]: JsonValue };

/**
 * Canonical JSON: object keys sorted by UTF-16 code units, no whitespace, numbers in their shortest
 * round-trip form (as JSON.stringify writes them). Anything JSON cannot carry faithfully is refused
 * rather than silently changed: NaN, Infinity, undefined, functions, bigints, symbols, dates.
 * Object properties whose value is undefined are omitted, as JSON.stringify would.
 */
export function canonicalJson(value: unknown): string {
  return write(value, "$");
}

function write(value: unknown, path: string): string {
  if (value === null) return "null";
  switch (typeof value) {
    case "boolean":
      return value ? "true" : "false";
    case "string":
      return JSON.stringify(value);
    case "number":
      if (!Number.isFinite(value)) throw new EngineError("not-finite", `Non-finite number at ${path}.`, path);
      return Object.is(value, -0) ? "0" : JSON.stringify(value);
    case "object": {
      if (Array.isArray(value)) {
        return `[${value
          .map((v, i) => {
            if (v === undefined) throw new EngineError("not-json", `Undefined array entry at ${path}[${i}].`, path);
            return write(v, `${path}[${i}]`);
          })
          .join(",")}]`;
      }
      const proto = Object.getPrototypeOf(value);
      if (proto !== Object.prototype && proto !== null) {
        throw new EngineError("not-json", `Only plain objects can be serialised (at ${path}).`, path);
      }
      const record = value as Record<string, unknown>;
      const keys = Object.keys(record)
        .filter((k) => record[k] !== undefined)
        .sort();
      return `{${keys.map((k) => `${JSON.stringify(k)}:${write(record[k], `${path}.${k}`)}`).join(",")}}`;
    }
    default:
      throw new EngineError("not-json", `A ${typeof value} cannot be serialised (at ${path}).`, path);
  }
}
