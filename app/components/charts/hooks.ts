/** Hooks shared by the chart components (client behaviour; SSR-safe). */
import { useCallback, useEffect, useLayoutEffect, useRef, useState } from "react";
import { stepCursor } from "~/utils/series-lookup";

/** useLayoutEffect in the browser, useEffect on the server (where neither runs). */
const useIsomorphicLayoutEffect = typeof window === "undefined" ? useEffect : useLayoutEffect;

/**
 * Width of an element in whole px, from a ResizeObserver. Null until mounted in the browser:
 * the server renders a sized placeholder and the chart draws after hydration.
 */
export function useContainerWidth<T extends HTMLElement>(): [React.RefObject<T | null>, number | null] {
  const ref = useRef<T | null>(null);
  const [width, setWidth] = useState<number | null>(null);
  useIsomorphicLayoutEffect(() => {
    const el = ref.current;
    if (!el) return;
    setWidth(Math.floor(el.getBoundingClientRect().width));
    if (typeof ResizeObserver === "undefined") return;
    const ro = new ResizeObserver((entries) => {
      const w = Math.floor(entries[0]?.contentRect.width ?? 0);
      setWidth((old) => (old === w ? old : w));
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, width];
}

export type CursorVia = "pointer" | "click" | "key";

/**
 * The day cursor: an index into the chart's sample days `t`. Starts at the last sample (the
 * readout then shows the end of the run). `announce` is set for keyboard moves and clicks, not
 * for pointer hover, so a screen reader is not flooded while a mouse passes over the chart.
 */
export function useDayCursor(
  t: ArrayLike<number>,
  describe: (i: number) => string,
  onCursorChange?: (day: number) => void,
) {
  const [index, setIndex] = useState(() => Math.max(0, t.length - 1));
  const [announcement, setAnnouncement] = useState("");
  const i = Math.min(index, Math.max(0, t.length - 1));

  const describeRef = useRef(describe);
  const onChangeRef = useRef(onCursorChange);
  useIsomorphicLayoutEffect(() => {
    describeRef.current = describe;
    onChangeRef.current = onCursorChange;
  });

  const moveTo = useCallback((next: number, via: CursorVia) => {
    setIndex(next);
    if (via !== "pointer") setAnnouncement(describeRef.current(next));
  }, []);

  const onKeyDown = useCallback(
    (e: React.KeyboardEvent) => {
      if (e.altKey || e.ctrlKey || e.metaKey) return;
      const next = stepCursor(t, i, e.key);
      if (next == null) return;
      e.preventDefault();
      moveTo(next, "key");
    },
    [t, i, moveTo],
  );

  const day = t.length ? t[i] : NaN;
  useEffect(() => {
    if (Number.isFinite(day)) onChangeRef.current?.(day);
  }, [day]);

  return { index: i, day, moveTo, onKeyDown, announcement };
}

/**
 * A value that may be controlled by the parent (`value` given) or kept here (`initial`).
 * `set` always calls `onChange`.
 */
export function useControllable<T>(
  value: T | undefined,
  initial: () => T,
  onChange?: (v: T) => void,
): [T, (v: T) => void] {
  const [own, setOwn] = useState<T>(initial);
  const current = value !== undefined ? value : own;
  const set = useCallback(
    (v: T) => {
      if (value === undefined) setOwn(v);
      onChange?.(v);
    },
    [value, onChange],
  );
  return [current, set];
}
