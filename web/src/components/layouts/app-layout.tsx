import clsx from "clsx";
import type { ReactNode } from "react";
import { NavLink } from "react-router-dom";
import { Button } from "../ui/button";
import { Wordmark } from "../ui/wordmark";

export type NavItem = { label: string; href: string; end?: boolean; note?: string };
export type NavGroup = { label: string; items: NavItem[] };

type AppLayoutProps = {
  nav: NavGroup[];
  user: { name: string; email: string; roleLabel: string; teamName: string };
  onSignOut: () => void;
  signingOut: boolean;
  children: ReactNode;
};

export function AppLayout({ nav, user, onSignOut, signingOut, children }: AppLayoutProps) {
  return (
    <div className="flex min-h-screen">
      <a
        href="#main"
        className="sr-only z-50 rounded-md bg-amber px-3 py-2 font-medium text-ink-deep focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <aside data-surface="ink" className="w-56 shrink-0 bg-ink text-paper">
        <div className="sticky top-0 flex h-screen flex-col">
        <div className="flex h-14 items-center border-b border-ink-line px-4">
          <Wordmark inverse />
        </div>
        <nav aria-label="Main" className="flex-1 overflow-y-auto px-2 py-3">
          {nav.map((group) => (
            <div key={group.label} className="mb-4">
              <p className="px-2 pb-1 text-[0.6875rem] font-semibold tracking-wider text-paper/60 uppercase">
                {group.label}
              </p>
              <ul className="flex flex-col gap-px">
                {group.items.map((item) => (
                  <li key={item.href}>
                    <NavLink
                      to={item.href}
                      end={item.end}
                      className={({ isActive }) =>
                        clsx(
                          "flex items-center justify-between rounded-md border-l-2 px-2 py-1.5 text-[0.8125rem] transition-colors",
                          isActive
                            ? "border-amber bg-ink-line font-semibold text-paper"
                            : "border-transparent text-paper/80 hover:bg-ink-line/60 hover:text-paper",
                        )
                      }
                    >
                      {item.label}
                      {item.note ? <span aria-hidden className="text-[0.625rem] tracking-wide text-paper/55 uppercase">{item.note}</span> : null}
                    </NavLink>
                  </li>
                ))}
              </ul>
            </div>
          ))}
        </nav>
        <div role="group" aria-label="Signed-in user" className="border-t border-ink-line px-4 py-3">
          <p className="truncate text-[0.8125rem] font-medium text-paper" title={user.name}>
            {user.name}
          </p>
          <p className="truncate text-xs text-paper/70" title={user.email}>
            {user.email}
          </p>
          <p className="mt-2 text-xs leading-snug text-paper/80">{user.teamName}</p>
          <p className="mt-1">
            <span className="rounded-sm bg-amber px-1.5 py-px text-xs font-semibold text-ink-deep">{user.roleLabel}</span>
          </p>
          <Button
            size="sm"
            variant="on-ink"
            onClick={onSignOut}
            busy={signingOut}
            className="mt-2.5 w-full"
          >
            Sign out
          </Button>
        </div>
        </div>
      </aside>
      <main id="main" tabIndex={-1} className="min-w-0 flex-1 px-8 py-6 focus:outline-none">
        <div className="mx-auto flex max-w-6xl flex-col gap-5">{children}</div>
      </main>
    </div>
  );
}
