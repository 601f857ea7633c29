import { useCallback, useState } from "react";

/**
 * Page-by-page navigation over an opaque-cursor API: the stack holds the cursor of every page visited, so
 * "previous" needs no backwards cursor. `reset` goes back to page one (call it when filters change).
 */
export function useCursorPager() {
  const [stack, setStack] = useState<Array<string | null>>([null]);
  const cursor = stack[stack.length - 1] ?? null;
  const next = useCallback((nextCursor: string) => setStack((s) => [...s, nextCursor]), []);
  const previous = useCallback(() => setStack((s) => (s.length > 1 ? s.slice(0, -1) : s)), []);
  const reset = useCallback(() => setStack([null]), []);
  return { cursor, page: stack.length, next, previous, reset, hasPrevious: stack.length > 1 };
}
