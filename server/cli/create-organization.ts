// `npm run org:create`: a new organization and its first administrator — how a production
// installation, which has no demo accounts, gets its first person in. Works at a terminal
// (asks for what is missing, the password without echo) and without one (flags or
// environment; a password is then generated and printed once, unless given):
//
//   npm run org:create -- --name "Harbour County Emergency Management" --admin-email chief@harbour.example --admin-name "Ada Quay"
//
// Flags, or the environment variable beside each: --name (CUTLINE_ORG_NAME), --slug
// (CUTLINE_ORG_SLUG, default from the name), --admin-email (CUTLINE_ADMIN_EMAIL), --admin-name
// (CUTLINE_ADMIN_NAME); the password from CUTLINE_ADMIN_PASSWORD, from standard input with
// --password-stdin, generated with --generate-password, else asked for at a terminal or generated.
// Exit status: 0 created, 1 refused (slug or e-mail taken), 2 bad or missing input.
import { randomBytes } from 'node:crypto';
import { createInterface } from 'node:readline';
import { parseArgs } from 'node:util';
import { z } from 'zod';
import { loadConfig } from '../config';
import { createDatabase } from '../db/client';
import { HttpError } from '../errors';
import { organizationCreateSchema, slugOf } from '../../shared/api/organizations';
import { passwordSchema } from '../../shared/api/users';
import { createOrganizationWithAdministrator } from '../services/organizations';

const usage = 'Usage: npm run org:create -- --name NAME --admin-email EMAIL --admin-name NAME [--slug SLUG] [--password-stdin | --generate-password]';

const { values: flags } = parseArgs({
  options: {
    name: { type: 'string' },
    slug: { type: 'string' },
    'admin-email': { type: 'string' },
    'admin-name': { type: 'string' },
    'password-stdin': { type: 'boolean', default: false },
    'generate-password': { type: 'boolean', default: false },
    help: { type: 'boolean', default: false },
  },
});
if (flags.help) {
  console.log(usage);
  process.exit(0);
}

const interactive = process.stdin.isTTY === true;

function ask(question: string, hidden = false): Promise<string> {
  const rl = createInterface({ input: process.stdin, output: process.stdout, terminal: true });
  // A hidden answer: the prompt is written, the keystrokes are not.
  let muted = false;
  if (hidden) (rl as unknown as { _writeToOutput: (s: string) => void })._writeToOutput = (s) => !muted && process.stdout.write(s);
  const answer = new Promise<string>((resolve) => rl.question(question, resolve));
  muted = true;
  return answer.finally(() => {
    rl.close();
    if (hidden) process.stdout.write('\n');
  });
}

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer);
  return Buffer.concat(chunks).toString('utf8').replace(/\r?\n$/, '');
}

/** 24 characters from 18 random bytes (144 bits), redrawn until it mixes letters with others. */
function generatePassword(): string {
  for (;;) {
    const candidate = randomBytes(18).toString('base64url');
    if (passwordSchema.safeParse(candidate).success) return candidate;
  }
}

async function value(flag: string | undefined, env: string | undefined, question: string): Promise<string | undefined> {
  if (flag !== undefined) return flag;
  if (env !== undefined && env !== '') return env;
  return interactive ? ask(question) : undefined;
}

async function password(): Promise<{ password: string; generated: boolean }> {
  const env = process.env.CUTLINE_ADMIN_PASSWORD;
  if (env) return { password: env, generated: false };
  if (flags['password-stdin']) return { password: await readStdin(), generated: false };
  if (flags['generate-password'] || !interactive) return { password: generatePassword(), generated: true };
  for (;;) {
    const first = await ask('Password for the administrator (at least 12 characters; empty: generate one): ', true);
    if (first === '') return { password: generatePassword(), generated: true };
    const check = passwordSchema.safeParse(first);
    if (!check.success) {
      console.log(check.error.issues.map((i) => i.message).join(' '));
      continue;
    }
    if ((await ask('The same again: ', true)) === first) return { password: first, generated: false };
    console.log('The two passwords differ; try again.');
  }
}

function fail(status: number, message: string): never {
  console.error(message);
  process.exit(status);
}

const name = await value(flags.name, process.env.CUTLINE_ORG_NAME, 'Organization name: ');
const email = await value(flags['admin-email'], process.env.CUTLINE_ADMIN_EMAIL, 'Administrator e-mail: ');
const displayName = await value(flags['admin-name'], process.env.CUTLINE_ADMIN_NAME, 'Administrator name: ');
if (!name || !email || !displayName) fail(2, `Missing ${[!name && '--name', !email && '--admin-email', !displayName && '--admin-name'].filter(Boolean).join(', ')}.\n${usage}`);
const slug = flags.slug ?? (process.env.CUTLINE_ORG_SLUG || slugOf(name));
const secret = await password();

const parsed = organizationCreateSchema.safeParse({ organization: { name, slug }, administrator: { email, displayName, password: secret.password } });
if (!parsed.success) fail(2, z.prettifyError(parsed.error));

const config = loadConfig();
const { db, pool } = createDatabase(config.DATABASE_URL);
try {
  await createOrganizationWithAdministrator(db, parsed.data, config.PASSWORD_HASH_ROUNDS);
  console.log(`Created the organization "${parsed.data.organization.name}" (${parsed.data.organization.slug}) with its administrator ${parsed.data.administrator.email}.`);
  if (secret.generated) console.log(`Password, shown only now: ${secret.password}\nSign in and keep it somewhere safe; administrators add the other members on the members page.`);
} catch (err) {
  if (err instanceof HttpError) fail(1, err.message);
  throw err;
} finally {
  await pool.end();
}
