import fs from "node:fs";

/** CPU time (user + system) a process has used, in ms, from /proc (Linux). */
export function cpuMs(pid: number): number {
  const fields = fs.readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1].split(" ");
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / 100; // utime, stime in clock ticks (USER_HZ 100)
}
