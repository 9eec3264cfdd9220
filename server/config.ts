// The environment, parsed once. Everything the server reads from process.env is here.
import { z } from 'zod';

const defaultPort = process.env.CUTLINE_PG_PORT ?? '54329';

const configSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z.string().url().default(`postgres://postgres@127.0.0.1:${defaultPort}/cutline`),
  SESSION_SECRET: z.string().min(16).default('cutline-development-session-secret'),
  // Secure cookies need HTTPS in front of the server; off by default so loopback use works.
  COOKIE_SECURE: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
  SIGN_IN_ATTEMPTS_PER_WINDOW: z.coerce.number().int().positive().default(10),
  SIGN_IN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  PASSWORD_HASH_ROUNDS: z.coerce.number().int().min(4).max(15).default(11),
  TILE_URL: z.string().default(''),
  // Per-run budget: a larger problem is refused before it starts; a longer or hungrier solve is stopped.
  RUN_MAX_EXPANDED_ARCS: z.coerce.number().int().positive().default(30_000_000),
  RUN_TIME_BUDGET_SECONDS: z.coerce.number().positive().default(900),
  RUN_MEMORY_BUDGET_MEGABYTES: z.coerce.number().int().min(64).default(6144),
  UPLOAD_MAX_MEGABYTES: z.coerce.number().positive().max(2048).default(256),
});

export type Config = z.infer<typeof configSchema>;

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = configSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid environment:\n${lines.join('\n')}`);
  }
  return parsed.data;
}
