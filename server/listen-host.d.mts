export function modeOf(env: Record<string, string | undefined>): "local" | "production";
export function chooseListenHost(env: Record<string, string | undefined>): { host: string; note: string | null };
