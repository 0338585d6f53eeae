/**
 * A wide table on a narrow screen scrolls inside its own box, not the whole page (issue 12,
 * item 10). While columns are hidden a line says so and a shadow marks the hidden edge; the
 * first column stays in place (app.css, .scroll-table). The box is `relative` so that
 * visually hidden text inside the table (sr-only, absolutely placed) is clipped by it instead
 * of widening the page, and focusable so a keyboard can scroll it.
 */
import { useEffect, useRef, useState, type ReactNode } from "react";

type Hidden = "none" | "right" | "left" | "both";

function hiddenSides(el: HTMLElement): Hidden {
  const left = el.scrollLeft > 1;
  const right = el.scrollLeft + el.clientWidth < el.scrollWidth - 1;
  return left && right ? "both" : left ? "left" : right ? "right" : "none";
}

export function ScrollTable({
  label,
  className = "",
  children,
}: {
  label: string;
  className?: string;
  children: ReactNode;
}) {
  const box = useRef<HTMLDivElement>(null);
  const [hidden, setHidden] = useState<Hidden>("none");
  useEffect(() => {
    const el = box.current;
    if (!el) return;
    const update = () => setHidden(hiddenSides(el));
    update();
    el.addEventListener("scroll", update, { passive: true });
    const resized = new ResizeObserver(update);
    resized.observe(el);
    return () => {
      el.removeEventListener("scroll", update);
      resized.disconnect();
    };
  }, []);
  return (
    <div className="min-w-0 space-y-1">
      {hidden !== "none" ? (
        <p className="text-xs text-stone-600" aria-hidden="true">
          {hidden === "left" ? "← More columns to the left" : "More columns: scroll sideways →"}
        </p>
      ) : null}
      <div
        ref={box}
        role="region"
        aria-label={label}
        tabIndex={0}
        data-hidden={hidden}
        className={`scroll-table ${className}`}
      >
        {children}
      </div>
    </div>
  );
}
