// Timings of the background re-check, from the environment. Read once when the service starts;
// a bad value stops the start with a message naming the variable.
import { DEFAULT_TIME_LIMIT_MS } from '../../flow/runner';
import { ConfigError } from '../config';

export interface CheckSettings {
  /** A check starts this long after the last accepted edit of a derivation (ms). */
  delayMs: number;
  /** ...but no later than this after the first edit it waited for, even while typing goes on (ms). */
  maxDelayMs: number;
  /** The solver's time bound per claim (ms). */
  timeLimitMs: number;
}

export const defaultCheckSettings: CheckSettings = { delayMs: 2_500, maxDelayMs: 15_000, timeLimitMs: DEFAULT_TIME_LIMIT_MS };

const variables: Record<keyof CheckSettings, string> = {
  delayMs: 'MARGINALIA_CHECK_DELAY_MS',
  maxDelayMs: 'MARGINALIA_CHECK_MAX_DELAY_MS',
  timeLimitMs: 'MARGINALIA_CHECK_TIME_LIMIT_MS',
};

export function readCheckSettings(env: Record<string, string | undefined>): CheckSettings {
  const settings = { ...defaultCheckSettings };
  for (const key of Object.keys(variables) as (keyof CheckSettings)[]) {
    const raw = env[variables[key]];
    if (raw === undefined || raw === '') continue;
    const value = Number(raw);
    if (!Number.isInteger(value) || value < 0) throw new ConfigError(`${variables[key]} must be a whole number of milliseconds (0 or more), not "${raw}".`);
    settings[key] = value;
  }
  if (settings.maxDelayMs < settings.delayMs) {
    throw new ConfigError(`${variables.maxDelayMs} (${settings.maxDelayMs}) must not be below ${variables.delayMs} (${settings.delayMs}).`);
  }
  if (settings.timeLimitMs < 1) throw new ConfigError(`${variables.timeLimitMs} must be at least 1.`);
  return settings;
}
