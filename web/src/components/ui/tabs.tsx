import clsx from "clsx";
import { NavLink } from "react-router-dom";

/** Page sections that live at their own address, so a reload or a shared link opens the same one. */
export function LinkTabs({ label, tabs }: { label: string; tabs: Array<{ label: string; href: string; end?: boolean }> }) {
  return (
    <nav aria-label={label} className="flex gap-1 border-b border-rule">
      {tabs.map((tab) => (
        <NavLink
          key={tab.href}
          to={tab.href}
          end={tab.end ?? true}
          className={({ isActive }) =>
            clsx(
              "-mb-px border-b-2 px-3 py-2 text-[0.8125rem] font-medium",
              isActive ? "border-amber text-ink" : "border-transparent text-ink-muted hover:border-rule-strong hover:text-ink",
            )
          }
        >
          {tab.label}
        </NavLink>
      ))}
    </nav>
  );
}
