/**
 * What the tank list and the tank page say of a tank's journal: the dangers its up-to-date replay
 * found (none: a quiet journal, nothing shown), or that it is not replayed yet ("later": over the
 * list's replays a view, "refused": the run gate said no or the run failed). Null: no entries.
 * Client-safe.
 */
export type JournalFlag = { state: "found"; dangers: string[] } | { state: "later" | "refused" } | null;
