// One query-key factory for the office; mutations invalidate exactly the keys they change.
export const officeKeys = {
  all: ["office"] as const,
  settings: () => [...officeKeys.all, "settings"] as const,
  payments: () => [...officeKeys.all, "payments"] as const,
  payment: (paymentId: string) => [...officeKeys.payments(), paymentId] as const,
  instruments: () => [...officeKeys.all, "instruments"] as const,
  parts: (q: string, show: string) => [...officeKeys.all, "parts", q, show] as const,
  allParts: () => [...officeKeys.all, "parts"] as const,
};
