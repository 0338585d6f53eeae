/**
 * bcrypt is slow on purpose (~135 ms a hash at cost 11 here), and bcryptjs works on the event
 * loop in slices of up to 100 ms. Many at once would stall every other request: 100 parallel
 * sign-ins ran 100 slices back to back between two turns of the loop. So password work goes
 * through one slot at a time; others wait their turn without blocking anything, and when too
 * many are already waiting the request is told to come back in a moment.
 */
const PASSWORD_WORK = { concurrent: 1, maxWaiting: 64 } as const;

export class PasswordWorkBusy extends Error {
  constructor() {
    super("Many people are signing in right now. Try again in a few seconds.");
  }
}

let running = 0;
const waiting: (() => void)[] = [];

/** Runs `work` in a password slot (throws PasswordWorkBusy when the queue is full). */
export async function withPasswordSlot<T>(work: () => Promise<T>): Promise<T> {
  if (running >= PASSWORD_WORK.concurrent) {
    if (waiting.length >= PASSWORD_WORK.maxWaiting) throw new PasswordWorkBusy();
    await new Promise<void>((resolve) => waiting.push(resolve));
  } else {
    running++;
  }
  try {
    return await work();
  } finally {
    const next = waiting.shift();
    if (next) next();
    else running--;
  }
}
