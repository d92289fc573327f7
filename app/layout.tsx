import type { Metadata, Viewport } from "next";
import { connection } from "next/server";
import type { ReactNode } from "react";
import { env } from "@/lib/server/env";
import { plexMono, plexSans, sourceSerif } from "./fonts";
import "./globals.css";

export const metadata: Metadata = {
  title: { default: "Kestrel Lane Wireless — vintage radio restoration", template: "%s · Kestrel Lane Wireless" },
  description: "Mail-in restoration, alignment and safety work for vintage tube and transistor radios, with a signed warranty certificate.",
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#2a2320" };

export default async function RootLayout({ children }: { children: ReactNode }) {
  // Every page renders per request: its scripts carry the nonce of that response's Content Security Policy.
  await connection();
  return (
    <html lang="en" className={`${plexSans.variable} ${sourceSerif.variable} ${plexMono.variable}`}>
      <body className="min-h-screen">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-white focus:p-2">
          Skip to content
        </a>
        {children}
        {env().BANDEDGE_LOCAL_DEMO ? (
          <aside
            aria-label="Local demo"
            data-local-demo
            className="border-t border-brass bg-brass-light px-4 py-1 text-center text-2xs text-bakelite"
          >
            Local demo: mail, payments and uploads go to stand-ins on this computer, and the demo sign-ins are public.
          </aside>
        ) : null}
      </body>
    </html>
  );
}
