/**
 * Runs every benchmark module in turn: `npm run bench`. Each module exports `run()` and prints
 * its own figures. Add new bench files to the list below.
 */
export {};

const benches: { name: string; load: () => Promise<{ run: () => unknown }> }[] = [
  { name: "engine", load: () => import("./engine") },
  { name: "results page", load: () => import("./results-page") },
  { name: "share page", load: () => import("./share-page") },
  { name: "readings, calibration and sweeps", load: () => import("./readings-and-sweeps") },
  { name: "results page SSR profile", load: () => import("./results-ssr-profile") },
  { name: "results page first views", load: () => import("./results-first-views") },
  { name: "load mix (1 and 2 app processes)", load: () => import("./load-mix") },
  { name: "sweeps on the queue (1 and 2 workers)", load: () => import("./queue-sweeps") },
];

for (const bench of benches) {
  const mod = await bench.load();
  await mod.run();
}
