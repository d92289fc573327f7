import type { ReactNode } from "react";

/**
 * A wide table on a narrow screen scrolls inside its own box, never the whole page. The box is a labelled,
 * focusable region so it can be scrolled from the keyboard too. Its width is contained: the table inside never
 * widens the grid or flex column around it, and it is positioned so that visually hidden labels (absolutely
 * placed) stay inside it instead of widening the page.
 */
export function TableScroll({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div
      role="region"
      aria-label={label}
      tabIndex={0}
      className="relative max-w-full overflow-x-auto [contain:inline-size] focus-visible:outline-2 focus-visible:outline-ember"
    >
      {children}
    </div>
  );
}
