import localFont from "next/font/local";

// Shipped with the app from @fontsource packages; nothing is fetched at build or run time.
export const plexSans = localFont({
  variable: "--font-plex-sans",
  display: "swap",
  src: [
    { path: "../node_modules/@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "../node_modules/@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "../node_modules/@fontsource/ibm-plex-sans/files/ibm-plex-sans-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
});

// Headings only: "optional" keeps a late font from re-wrapping headings and shifting the page (layout
// shift); preloaded from our own origin it is nearly always there for the first paint.
export const sourceSerif = localFont({
  variable: "--font-serif",
  display: "optional",
  adjustFontFallback: "Times New Roman",
  src: [
    { path: "../node_modules/@fontsource/source-serif-4/files/source-serif-4-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "../node_modules/@fontsource/source-serif-4/files/source-serif-4-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
});

// Figures only (amounts, job numbers, readings), which many pages do not show: fetched when used rather
// than preloaded everywhere, with the system monospace as its fallback (near enough the same advance).
export const plexMono = localFont({
  variable: "--font-plex-mono",
  display: "swap",
  preload: false,
  adjustFontFallback: false,
  src: [
    { path: "../node_modules/@fontsource/ibm-plex-mono/files/ibm-plex-mono-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "../node_modules/@fontsource/ibm-plex-mono/files/ibm-plex-mono-latin-600-normal.woff2", weight: "600", style: "normal" },
  ],
});
