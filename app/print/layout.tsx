import type { ReactNode } from "react";
import "./print.css";

/** Printable sheets: no navigation, paper colours; the browser's print makes the PDF. */
export default function PrintLayout({ children }: { children: ReactNode }) {
  return <div className="min-h-screen bg-white py-4">{children}</div>;
}
