import { Link } from "react-router";

/**
 * "Tanks / Living-room 120 / Baseline": where this page sits, each step a link but the last.
 * Without `current` the trail ends with its last link (e.g. "Back to the lesson").
 */
export function Breadcrumbs({ trail, current }: { trail: { to: string; label: string }[]; current?: string }) {
  return (
    <nav aria-label="Breadcrumb" className="text-sm">
      {trail.map((step, i) => (
        <span key={step.to}>
          <Link to={step.to} className="link">
            {step.label}
          </Link>
          {current || i < trail.length - 1 ? " / " : null}
        </span>
      ))}
      {current ? <span aria-current="page">{current}</span> : null}
    </nav>
  );
}
