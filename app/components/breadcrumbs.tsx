import { Link } from "react-router";

/** "Tanks / Living-room 120 / Baseline": where this page sits, each step a link but the last. */
export function Breadcrumbs({ trail, current }: { trail: { to: string; label: string }[]; current: string }) {
  return (
    <nav aria-label="Breadcrumb" className="text-sm">
      {trail.map((step) => (
        <span key={step.to}>
          <Link to={step.to} className="link">
            {step.label}
          </Link>{" "}
          /{" "}
        </span>
      ))}
      <span aria-current="page">{current}</span>
    </nav>
  );
}
