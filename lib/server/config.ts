/** Server configuration from the environment, with defaults (README, Configuration). */
export interface ServerConfig {
  idleTimeoutMin: number;
  sessionLifetimeHours: number;
  secureCookies: boolean;
}

/** A positive number from the environment, else the default (integers only when asked). */
export function positiveEnv(v: string | undefined, dflt: number, integer = false): number {
  const n = v === undefined ? NaN : Number(v);
  return (integer ? Number.isInteger(n) : Number.isFinite(n)) && n > 0 ? n : dflt;
}
const num = (v: string | undefined, dflt: number) => positiveEnv(v, dflt);

export function serverConfig(env: NodeJS.ProcessEnv = process.env): ServerConfig {
  return {
    idleTimeoutMin: num(env.PLATEAU_IDLE_TIMEOUT_MIN, 30),
    sessionLifetimeHours: num(env.PLATEAU_SESSION_HOURS, 12),
    secureCookies: env.PLATEAU_SECURE_COOKIES === '1',
  };
}
