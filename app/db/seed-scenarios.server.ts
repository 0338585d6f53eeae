import type { Db } from "./client.server";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

/** Demo scenarios for the seeded tanks (filled in once the engine's schema exists). */
export function seedDemoScenarios(_tx: Tx, _tankIds: Record<"jonah" | "ines" | "theo" | "teacher", number>): void {}
