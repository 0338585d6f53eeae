import { Link } from "react-router";
import type { JournalFlag } from "~/features/journal/journal-flag";

/**
 * The flag, tinted and worded as the list's toxic-peak cells are (colour alone is not enough),
 * with the way to the journal page, where the replay says when and how far.
 * @param perView the list's replays a view, said when this tank was left for later
 */
export function JournalFlagNote({ tankId, flag, perView }: { tankId: number; flag: JournalFlag; perView?: number }) {
  if (!flag) return null;
  const href = `/tanks/${tankId}/journal`;
  if (flag.state === "found") {
    if (flag.dangers.length === 0) return null;
    return (
      <div className="rounded bg-red-50 p-2 text-sm text-red-900" data-journal-flag>
        <ul className="space-y-1">
          {flag.dangers.map((d) => (
            <li key={d} className="font-semibold">
              {d}
            </li>
          ))}
        </ul>
        <Link to={href} className="link text-xs">
          Open the journal to see when and how far
        </Link>
      </div>
    );
  }
  return (
    <p className="text-xs text-stone-600" data-journal-flag={flag.state}>
      {flag.state === "later"
        ? `The journal is not replayed since its last change (this list replays at most ${perView ?? 1} journals a view): `
        : "The journal could not be replayed just now: "}
      <Link to={href} className="link">
        open the journal to replay it
      </Link>
      .
    </p>
  );
}
