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
  { name: "load mix", load: () => import("./load-mix") },
];

for (const bench of benches) {
  const mod = await bench.load();
  await mod.run();
}
