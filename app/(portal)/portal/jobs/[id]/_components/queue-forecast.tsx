import { formatDay } from "@/lib/engine/dates";
import type { OwnerForecast } from "@/lib/server/services/turnaround";

// Forecast days are calendar days: written out, never shifted by a zone.
const day = (text: string): string => formatDay(text);

// The set's place in the bench queue and the days it is expected on the bench, while it waits for the bench.
export function QueueForecast({ forecast }: { forecast: OwnerForecast | null }) {
  if (!forecast || forecast.kind === "on-bench") return null;
  if (forecast.kind === "unknown")
    return (
      <p className="mt-2 text-sm" data-testid="queue-forecast">
        The shop has not set its bench hours yet, so we cannot say when your set will be on the bench; we will write when it is.
      </p>
    );
  const range =
    forecast.startDay === forecast.endDay
      ? `on ${day(forecast.startDay)}`
      : `between ${day(forecast.startDay)} and ${day(forecast.endDay)}`;
  return (
    <div className="mt-3 space-y-1" data-testid="queue-forecast">
      <p>
        <strong>Place in the bench queue: {forecast.position}</strong>
        {forecast.ahead === 0 ? " (next in line)" : ` (${forecast.ahead} ${forecast.ahead === 1 ? "job" : "jobs"} ahead)`}.
      </p>
      <p>Expected on the bench {range}.</p>
      <p className="text-sm text-bakelite-muted">
        {forecast.awaitingDeposit ? "Counted as if the deposit were paid today: your set joins the queue when it is. " : ""}A forecast from
        the approved bench time of the jobs ahead and the technicians&apos; hours; it moves as the queue does.
      </p>
    </div>
  );
}
