import { NavLink } from "react-router";

/** Tabs between the admin pages. */
export function AdminNav() {
  const tab = ({ isActive }: { isActive: boolean }) =>
    `rounded-md border px-3 py-1 text-sm ${isActive ? "border-fern-600 bg-fern-50 font-semibold text-fern-900" : "border-stone-300 bg-white text-stone-700 hover:border-fern-600"}`;
  return (
    <nav aria-label="Admin pages" className="flex flex-wrap gap-2">
      <NavLink to="/admin" end className={tab}>
        Users and roles
      </NavLink>
      <NavLink to="/admin/links" className={tab}>
        Public links
      </NavLink>
      <NavLink to="/admin/classes" className={tab}>
        Classes
      </NavLink>
    </nav>
  );
}
