export function postgresBinDir(): string | null;
export function startTempPostgres(opts?: { dir?: string; port?: number }): Promise<{ url: string; dir: string; stop(): void }>;
export function stopTempPostgres(dir: string): void;
export function scratchDatabase(prefix: string, adminUrl?: string): Promise<{ url: string; done(): Promise<void> }>;
