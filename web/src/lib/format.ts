function toDate(value: string | number | Date | null | undefined): Date | null {
  if (value === null || value === undefined) return null;
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

const pad = (n: number) => String(n).padStart(2, "0");

/** Local time as "2026-12-02 14:03": sortable, fixed width, unambiguous across locales. */
export function formatDateTime(value: string | number | Date | null | undefined): string {
  const d = toDate(value);
  if (!d) return "—";
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())} ${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

export function isoOrEmpty(value: string | number | Date | null | undefined): string | undefined {
  return toDate(value)?.toISOString();
}

/** Local calendar date as "2026-12-02". */
export function formatDate(value: string | number | Date | null | undefined): string {
  const d = toDate(value);
  return d ? `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}` : "—";
}

const GROUPED = new Intl.NumberFormat("en-US", { maximumFractionDigits: 0 });

/** Whole numbers with thousands separators: "12,345,678". */
export function formatCount(value: number | null | undefined): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "—" : GROUPED.format(value);
}

const BYTE_UNITS = ["B", "KiB", "MiB", "GiB", "TiB"] as const;

/** Binary units with three significant figures: "1.46 GiB". */
export function formatBytes(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  let unit = 0;
  let scaled = value;
  while (scaled >= 1024 && unit < BYTE_UNITS.length - 1) {
    scaled /= 1024;
    unit++;
  }
  return unit === 0 ? `${value} B` : `${scaled.toPrecision(3)} ${BYTE_UNITS[unit]}`;
}

/** Scientific notation for residuals, bounds and tolerances: "3.41e-10". */
export function formatSci(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  return value.toExponential(digits).replace("e+", "e");
}

/** A parameter like a tolerance, without padding zeros: "1e-9", "2.5e-7". */
export function formatSciCompact(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (value === 0) return "0";
  return value.toExponential().replace("e+", "e");
}

/** Scores keep six significant figures in one fixed shape so a column of them lines up: "2.71828e-3". */
export function formatScore(value: number | null | undefined): string {
  return formatSci(value, 5);
}

/** A fraction as a percentage: "87.5 %". */
export function formatPercent(value: number | null | undefined, digits = 1): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "—" : `${(value * 100).toFixed(digits)} %`;
}

/** A plain decimal with a fixed number of places, e.g. a correlation "0.9812". */
export function formatDecimal(value: number | null | undefined, digits = 4): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "—" : value.toFixed(digits);
}

/** Short durations in ms, longer ones in s, min and h: "840 ms", "12.4 s", "3 min 05 s", "1 h 02 min". */
export function formatDuration(ms: number | null | undefined): string {
  if (ms === null || ms === undefined || !Number.isFinite(ms) || ms < 0) return "—";
  if (ms < 1000) return `${ms < 10 ? ms.toFixed(1) : Math.round(ms)} ms`;
  const s = ms / 1000;
  if (s < 60) return `${s.toFixed(1)} s`;
  const totalSeconds = Math.round(s);
  const minutes = Math.floor(totalSeconds / 60);
  if (minutes < 60) return `${minutes} min ${pad(totalSeconds % 60)} s`;
  return `${Math.floor(minutes / 60)} h ${pad(minutes % 60)} min`;
}

/** Large per-second rates with a metric prefix: "48.2 M/s". */
export function formatRate(perSecond: number | null | undefined): string {
  if (perSecond === null || perSecond === undefined || !Number.isFinite(perSecond)) return "—";
  const prefixes = [
    [1e9, "G"],
    [1e6, "M"],
    [1e3, "k"],
  ] as const;
  for (const [factor, prefix] of prefixes) {
    if (perSecond >= factor) return `${(perSecond / factor).toPrecision(3)} ${prefix}/s`;
  }
  return `${perSecond.toPrecision(3)}/s`;
}

/** Time between two instants, or from one until now when the end is missing. */
export function elapsedMs(start: string | null | undefined, end?: string | null): number | null {
  const a = toDate(start);
  if (!a) return null;
  const b = toDate(end) ?? new Date();
  return Math.max(0, b.getTime() - a.getTime());
}
