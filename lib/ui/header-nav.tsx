"use client";
/**
 * The header's navigation, hidden on panelist pages (/p/…): panelists have no account and
 * nothing there concerns them.
 */
import type { ReactNode } from "react";
import { usePathname } from "next/navigation";

export default function HeaderNav({ children }: { children: ReactNode }) {
  const path = usePathname();
  if (path?.startsWith("/p/")) return null;
  return <nav aria-label="Main">{children}</nav>;
}
