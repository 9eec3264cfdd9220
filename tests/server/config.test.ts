// The environment check: production refuses the public development secrets; bad values are
// named with what is wrong, all at once.
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

describe('loadConfig', () => {
  it('accepts the development defaults outside production', () => {
    expect(loadConfig({ NODE_ENV: 'development' }).SESSION_SECRET.length).toBeGreaterThanOrEqual(16);
  });

  it('refuses the development session secret and signing passphrase in production', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET: set a secret of your own[\s\S]*SIGNING_KEY_PASSPHRASE: set a secret/);
    expect(() => loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32) })).toThrow(/SIGNING_KEY_PASSPHRASE/);
    expect(loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32), SIGNING_KEY_PASSPHRASE: 'b'.repeat(16) }).NODE_ENV).toBe('production');
  });

  it('names each bad value', () => {
    expect(() => loadConfig({ PORT: 'eighty', RUN_STARTS_PER_MINUTE: '0' })).toThrow(/PORT:[\s\S]*RUN_STARTS_PER_MINUTE:/);
  });
});
