"use client";

import { createContext, useContext, type ReactNode } from "react";
import { DEFAULT_SHOP_TIME_ZONE } from "@/lib/engine/dates";

// The shop's zone, handed down by the area's server layout, so a browser elsewhere in the world renders the
// same dates and times as the server did (its own zone is never used).
const ShopTimeZoneContext = createContext<string>(DEFAULT_SHOP_TIME_ZONE);

export function ShopTimeZoneProvider({ timeZone, children }: { timeZone: string; children: ReactNode }) {
  return <ShopTimeZoneContext.Provider value={timeZone}>{children}</ShopTimeZoneContext.Provider>;
}

export function useShopTimeZone(): string {
  return useContext(ShopTimeZoneContext);
}
