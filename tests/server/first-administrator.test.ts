// A production installation has no demo accounts: `npm run db:seed` (and `npm start`) seed the
// demo organization only where NODE_ENV is not production or when asked, seed it once (what its
// administrator changes stays changed), and `npm run org:create` makes an organization and its
// first administrator — at a terminal or without one (flags, environment, no standard input).
import { spawnSync } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { loadConfig } from '../../server/config';
import { demoAccounts, demoOrganization } from '../../server/seed/demo-accounts';
import { demoWanted, runSeed } from '../../server/seed/seed-command';
import { seedDemo } from '../../server/seed/seed-demo';
import { createTestDatabase, type TestDatabase } from './support/database';
import { signIn } from './support/test-app';

const productionSecrets = { SESSION_SECRET: 'a production session secret of our own', SIGNING_KEY_PASSPHRASE: 'a production signing passphrase of our own, long enough' };

describe('seeding the demo organization', () => {
  let database: TestDatabase;
  beforeAll(async () => {
    database = await createTestDatabase();
  });
  afterAll(async () => {
    await database.drop();
  });
  const organizations = async () => (await database.pool.query<{ slug: string }>('SELECT slug FROM organizations')).rows.map((r) => r.slug);

  it('is wanted outside production, in production only when asked for', () => {
    expect(demoWanted({ NODE_ENV: 'development', SEED_DEMO: 'auto' }, false)).toBe(true);
    expect(demoWanted({ NODE_ENV: 'test', SEED_DEMO: 'auto' }, false)).toBe(true);
    expect(demoWanted({ NODE_ENV: 'production', SEED_DEMO: 'auto' }, false)).toBe(false);
    expect(demoWanted({ NODE_ENV: 'production', SEED_DEMO: 'auto' }, true)).toBe(true);
    expect(demoWanted({ NODE_ENV: 'production', SEED_DEMO: 'yes' }, false)).toBe(true);
    expect(demoWanted({ NODE_ENV: 'development', SEED_DEMO: 'no' }, false)).toBe(false);
  });

  it('seeds nothing under NODE_ENV=production, and says how to make the first administrator', async () => {
    const config = loadConfig({ NODE_ENV: 'production', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4', ...productionSecrets });
    const { seeded, message } = await runSeed(database.db, config, false);
    expect(seeded).toBe(false);
    expect(message).toContain('npm run org:create');
    expect(await organizations()).toEqual([]);
  });

  it('seeds the demo in development, once: a demoted or re-passworded demo account stays so at the next start', async () => {
    const config = loadConfig({ NODE_ENV: 'development', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4' });
    expect((await runSeed(database.db, config, false)).seeded).toBe(true);
    expect(await organizations()).toEqual([demoOrganization.slug]);
    const admin = demoAccounts.find((a) => a.role === 'admin')!;
    const planner = demoAccounts.find((a) => a.role === 'planner')!;
    await database.pool.query(`UPDATE memberships SET role = 'viewer' WHERE user_id = (SELECT id FROM users WHERE email = $1)`, [planner.email]);
    await database.pool.query(`UPDATE users SET password_hash = 'changed' WHERE email = $1`, [admin.email]);
    await database.pool.query(`DELETE FROM memberships WHERE user_id = (SELECT id FROM users WHERE email = $1)`, [demoAccounts.find((a) => a.role === 'viewer')!.email]);
    const again = await seedDemo(database.db, 4);
    expect(again.created).toBe(false);
    expect(again.planId).not.toBeNull();
    const roles = await database.pool.query<{ email: string; role: string }>('SELECT u.email, m.role FROM memberships m JOIN users u ON u.id = m.user_id ORDER BY u.email');
    expect(roles.rows).toEqual(
      expect.arrayContaining([
        { email: planner.email, role: 'viewer' },
        { email: admin.email, role: 'admin' },
      ]),
    );
    expect(roles.rows).toHaveLength(3);
    expect((await database.pool.query('SELECT password_hash FROM users WHERE email = $1', [admin.email])).rows[0].password_hash).toBe('changed');
  });
});

describe('npm run org:create', () => {
  let database: TestDatabase;
  beforeAll(async () => {
    database = await createTestDatabase();
  });
  afterAll(async () => {
    await database.drop();
  });

  // As an operator runs it in a deployment script: no terminal, standard input closed.
  function command(args: string[], env: Record<string, string> = {}, input?: string) {
    const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/create-organization.ts', ...args], {
      env: { PATH: process.env.PATH, NODE_ENV: 'production', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4', ...productionSecrets, ...env },
      input,
      stdio: [input === undefined ? 'ignore' : 'pipe', 'pipe', 'pipe'],
      encoding: 'utf8',
      timeout: 120_000,
    });
    return { status: r.status, out: r.stdout, err: r.stderr };
  }
  const count = async (table: string) => Number((await database.pool.query(`SELECT count(*) AS n FROM ${table}`)).rows[0].n);

  it('creates the organization and its administrator from flags, generating a password it prints once', async () => {
    const r = command(['--name', 'Harbour County Emergency Management', '--admin-email', 'Chief@Harbour.example', '--admin-name', 'Ada Quay']);
    expect(r.err).toBe('');
    expect(r.status).toBe(0);
    expect(r.out).toContain('Created the organization "Harbour County Emergency Management" (harbour-county-emergency-management) with its administrator chief@harbour.example.');
    const password = /Password, shown only now: (\S+)/.exec(r.out)![1]!;
    expect(password.length).toBeGreaterThanOrEqual(20);
    const { rows } = await database.pool.query(
      `SELECT o.slug, u.email, m.role FROM memberships m JOIN users u ON u.id = m.user_id JOIN organizations o ON o.id = m.organization_id`,
    );
    expect(rows).toEqual([{ slug: 'harbour-county-emergency-management', email: 'chief@harbour.example', role: 'admin' }]);
    const audit = await database.pool.query('SELECT action, actor_user_id FROM audit_events ORDER BY id');
    expect(audit.rows).toEqual([
      { action: 'organization.create', actor_user_id: null },
      { action: 'member.create', actor_user_id: null },
    ]);
    // The printed password signs in, and the administrator manages members.
    const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4' });
    const app = createApp({ config, db: database.db, pool: database.pool, clientDir: '/nonexistent', runQueue: { enqueue: async () => undefined } as never, log: () => undefined });
    const admin = await signIn(app, 'chief@harbour.example', password);
    expect((await admin.agent.get('/api/members')).status).toBe(200);
  }, 180_000);

  it('takes everything from the environment, the password too, and never prints it then', async () => {
    const r = command([], { CUTLINE_ORG_NAME: 'Fenwick Borough', CUTLINE_ORG_SLUG: 'fenwick', CUTLINE_ADMIN_EMAIL: 'ops@fenwick.example', CUTLINE_ADMIN_NAME: 'Lio Fenn', CUTLINE_ADMIN_PASSWORD: 'fenwick-first-admin-7' });
    expect(r.status).toBe(0);
    expect(r.out).not.toContain('fenwick-first-admin-7');
    expect(r.out).not.toContain('Password');
    expect((await database.pool.query(`SELECT slug FROM organizations WHERE slug = 'fenwick'`)).rowCount).toBe(1);
  }, 180_000);

  it('reads the password from standard input when asked to', async () => {
    const r = command(['--name', 'Stdin Shire', '--admin-email', 'a@stdin.example', '--admin-name', 'Ana Stdin', '--password-stdin'], {}, 'piped-password-2026\n');
    expect(r.status).toBe(0);
    const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: database.url, PASSWORD_HASH_ROUNDS: '4' });
    const app = createApp({ config, db: database.db, pool: database.pool, clientDir: '/nonexistent', runQueue: { enqueue: async () => undefined } as never, log: () => undefined });
    await signIn(app, 'a@stdin.example', 'piped-password-2026');
  }, 180_000);

  it('refuses a taken short name or e-mail, a weak password and missing input, changing nothing', async () => {
    const before = { orgs: await count('organizations'), users: await count('users'), audit: await count('audit_events') };
    const taken = command(['--name', 'Another Harbour', '--slug', 'fenwick', '--admin-email', 'new@x.example', '--admin-name', 'N']);
    expect(taken.status).toBe(1);
    expect(taken.err).toContain('already exists');
    const email = command(['--name', 'Another Harbour', '--admin-email', 'ops@fenwick.example', '--admin-name', 'N']);
    expect(email.status).toBe(1);
    expect(email.err).toContain('e-mail address already exists');
    const weak = command(['--name', 'Weak Town', '--admin-email', 'w@weak.example', '--admin-name', 'W'], { CUTLINE_ADMIN_PASSWORD: 'short' });
    expect(weak.status).toBe(2);
    expect(weak.err).toContain('at least 12 characters');
    const missing = command(['--name', 'No Admin Town']);
    expect(missing.status).toBe(2);
    expect(missing.err).toContain('Missing --admin-email, --admin-name');
    expect({ orgs: await count('organizations'), users: await count('users'), audit: await count('audit_events') }).toEqual(before);
  }, 300_000);
});

describe('npm run start:production', () => {
  const start = (env: Record<string, string>) =>
    spawnSync('bash', ['docker-free-scripts/start-production.sh'], { env: { PATH: process.env.PATH, ...env }, stdio: ['ignore', 'pipe', 'pipe'], encoding: 'utf8', timeout: 120_000 });

  it('refuses to start without production settings, naming each, before installing or migrating anything', () => {
    const r = start({});
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('NODE_ENV=production');
    expect(r.stderr).toContain('DATABASE_URL');
    expect(r.stderr).toContain('SESSION_SECRET');
    expect(r.stderr).toContain('SIGNING_KEY_PASSPHRASE');
  });

  it('refuses the published development secrets', () => {
    const r = start({ NODE_ENV: 'production', DATABASE_URL: 'postgres://nobody@127.0.0.1:1/none', SESSION_SECRET: 'cutline-development-session-secret', SIGNING_KEY_PASSPHRASE: 'a production signing passphrase of our own' });
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('set a secret of your own in production');
    expect(r.stderr).not.toContain('applying migrations');
  }, 120_000);
});
