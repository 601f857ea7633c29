import clsx from "clsx";
import { TH } from "./table";

export type SortOrder = "asc" | "desc";

type SortHeaderProps<K extends string> = {
  label: string;
  column: K;
  sort: K;
  order: SortOrder;
  onSort: (column: K, order: SortOrder) => void;
  numeric?: boolean;
  /** The order a first click picks; numbers usually start large-first. */
  firstOrder?: SortOrder;
  className?: string;
};

/** A column header that sorts on click; aria-sort tells assistive technology which column leads. */
export function SortHeader<K extends string>({ label, column, sort, order, onSort, numeric, firstOrder = "asc", className }: SortHeaderProps<K>) {
  const active = sort === column;
  const next: SortOrder = active ? (order === "asc" ? "desc" : "asc") : firstOrder;
  return (
    <TH numeric={numeric} aria-sort={active ? (order === "asc" ? "ascending" : "descending") : "none"} className={className}>
      <button
        type="button"
        onClick={() => onSort(column, next)}
        className={clsx(
          "inline-flex items-center gap-1 uppercase hover:text-ink",
          active && "text-ink",
          numeric && "flex-row-reverse",
        )}
      >
        {label}
        <span aria-hidden className={clsx("text-[0.625rem]", !active && "opacity-30")}>
          {active && order === "asc" ? "▲" : "▼"}
        </span>
        <span className="sr-only">{active ? `, sorted ${order === "asc" ? "ascending" : "descending"}` : ", sortable"}</span>
      </button>
    </TH>
  );
}
