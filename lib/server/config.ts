/** Server configuration from the environment, with defaults (README, Configuration). */
import { positiveEnv } from '@/lib/_shared/positiveEnv';

export interface ServerConfig {
  idleTimeoutMin: number;
  sessionLifetimeHours: number;
  secureCookies: boolean;
}

const num = (v: string | undefined, dflt: number) => positiveEnv(v, dflt);

export function serverConfig(env: NodeJS.ProcessEnv = process.env): ServerConfig {
  return {
    idleTimeoutMin: num(env.PLATEAU_IDLE_TIMEOUT_MIN, 30),
    sessionLifetimeHours: num(env.PLATEAU_SESSION_HOURS, 12),
    secureCookies: env.PLATEAU_SECURE_COOKIES === '1',
  };
}
