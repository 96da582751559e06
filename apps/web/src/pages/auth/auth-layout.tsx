// Frame of the sign-in, sign-up and password pages.
import type { ReactNode } from 'react';
import { Logo } from '../../components/logo.tsx';

export function AuthLayout({ title, subtitle, children }: { title: string; subtitle?: ReactNode; children: ReactNode }) {
  return (
    <main className="flex min-h-full items-center justify-center px-4 py-10">
      <div className="grid w-full max-w-4xl overflow-hidden rounded-xl border border-[var(--line)] bg-[var(--panel)] shadow-sm md:grid-cols-[1fr_1.1fr]">
        <aside className="hidden flex-col justify-between bg-accent p-8 text-white md:flex">
          <Logo inverted />
          <div className="space-y-3">
            <p className="text-lg leading-snug font-semibold">The logbook and analysis bench for impact-hammer FRF campaigns.</p>
            <p className="text-sm text-white/80">Plan the points, register the kit, record and judge every hit, and hand over FRFs and modes that trace back to the hits that made them.</p>
          </div>
          <p className="text-xs text-white/70">Raw hits are never deleted. A rejected hit keeps its reason.</p>
        </aside>
        <section className="p-8">
          <div className="mb-6 md:hidden">
            <Logo />
          </div>
          <h1 className="text-xl font-semibold">{title}</h1>
          {subtitle && <p className="mt-1 text-sm text-[var(--muted)]">{subtitle}</p>}
          <div className="mt-6">{children}</div>
        </section>
      </div>
    </main>
  );
}
