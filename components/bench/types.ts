import type { BenchSheet, JobDetail } from "@/lib/server/services/bench";
import type { EstimateView } from "@/lib/server/services/estimates";

// What a value looks like after JSON: dates arrive as strings.
export type Jsonify<T> = T extends Date
  ? string
  : T extends (infer U)[]
    ? Jsonify<U>[]
    : T extends object
      ? { [K in keyof T]: Jsonify<T[K]> }
      : T;

export type JobDetailJson = Jsonify<JobDetail>;
export type EstimateViewJson = Jsonify<EstimateView>;
export type BenchSheetJson = Jsonify<BenchSheet>;
