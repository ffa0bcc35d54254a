import type { ReactNode } from "react";
import { Logo } from "@/components/ui/logo";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <main className="grid min-h-screen lg:grid-cols-[1fr_1.1fr]">
      <section className="flex flex-col justify-center px-6 py-12 sm:px-12">
        <div className="mx-auto w-full max-w-sm">
          <Logo className="text-xl" />
          <div className="mt-10">{children}</div>
        </div>
      </section>
      <aside className="relative hidden overflow-hidden border-l border-ink-800 bg-ink-900 lg:block" aria-hidden>
        <svg viewBox="0 0 600 600" className="absolute inset-0 h-full w-full opacity-70">
          <defs>
            <linearGradient id="g" x1="0" x2="1">
              <stop offset="0" stopColor="#2bb3a6" />
              <stop offset="1" stopColor="#f59e1b" />
            </linearGradient>
          </defs>
          <path d="M90 420 C 90 250, 180 140, 300 150 S 520 230, 500 330 S 380 470, 300 440 S 170 500, 90 420 Z" fill="none" stroke="#2a323c" strokeWidth="26" />
          <path d="M90 420 C 90 250, 180 140, 300 150 S 520 230, 500 330 S 380 470, 300 440 S 170 500, 90 420 Z" fill="none" stroke="url(#g)" strokeWidth="3" strokeDasharray="6 8" />
        </svg>
        <div className="absolute bottom-12 left-12 right-12">
          <p className="text-2xl font-semibold leading-snug">From logger export to a rider brief before the next session.</p>
          <p className="mt-3 max-w-md text-sm text-ink-300">Laps, overlays with the running gap, drive slip, suspension use and braking points for the whole team.</p>
        </div>
      </aside>
    </main>
  );
}
