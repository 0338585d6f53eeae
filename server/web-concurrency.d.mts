export function webConcurrency(env: Record<string, string | undefined>, cores: number): number;
