// One key factory for the owner's pages; mutations invalidate exactly the keys they change.
export const portalKeys = {
  all: ["portal"] as const,
  jobs: () => [...portalKeys.all, "jobs"] as const,
  job: (jobId: string) => [...portalKeys.all, "job", jobId] as const,
  messages: (jobId: string) => [...portalKeys.all, "messages", jobId] as const,
  paymentSession: (sessionId: string) => [...portalKeys.all, "payment-session", sessionId] as const,
};
