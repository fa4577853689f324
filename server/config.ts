import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { z } from 'zod';

/** The project's root folder (server/ is one level below it). */
export const rootDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
/** Runtime data: database files, generated secrets, the built client, test output. */
export const dataDir = process.env.DATA_DIR ? path.resolve(process.env.DATA_DIR) : path.join(rootDir, '.data');

const port = z.coerce.number().int().min(0).max(65535);
const flag = z
  .enum(['true', 'false', '1', '0', ''])
  .transform((v) => v === 'true' || v === '1');

/**
 * Every environment variable the app reads, with its default. README's configuration
 * table lists the same names; `.env.example` carries the defaults.
 */
const schema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: port.default(8080),
  PUBLIC_URL: z.string().url().optional(),
  DB_HOST: z.string().optional().transform((v) => (v ? v : undefined)),
  DB_PORT: port.default(3406),
  DB_NAME: z.string().regex(/^[A-Za-z0-9_]+$/).default('titrata'),
  DB_USER: z.string().regex(/^[A-Za-z0-9_]+$/).default('titrata'),
  DB_PASSWORD: z.string().default('titrata-local'),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(200).default(10),
  JWT_SECRET: z.string().min(32).optional(),
  JWT_TTL: z.string().default('8h'),
  /** Comma-separated earlier secrets still accepted (not used to sign) while a rotation runs out. */
  JWT_PREVIOUS_SECRETS: z.string().default(''),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: port.default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: flag.default(false),
  MAIL_FROM: z.string().default('Titrata <no-reply@titrata.example>'),
  MAILBOX_PORT: port.default(8026),
  PAYMENTS_HOST: z.string().default('127.0.0.1'),
  PAYMENTS_PORT: port.default(8091),
  PAYMENTS_PROTOCOL: z.enum(['http', 'https']).default('http'),
  PAYMENTS_SECRET_KEY: z.string().default('sk_test_titrata_local'),
  PAYMENTS_WEBHOOK_SECRET: z.string().default('whsec_titrata_local'),
  START_FAKES: flag.default(true),
  DEMO_PASSWORD: z.string().min(8).default('titrata-demo'),
  LOGIN_RATE_LIMIT: z.coerce.number().int().min(1).default(20),
  API_RATE_LIMIT: z.coerce.number().int().min(1).default(1200),
  JSON_LIMIT: z.string().default('256kb'),
  UPLOAD_LIMIT_BYTES: z.coerce.number().int().min(1024).default(1_048_576),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type Config = z.infer<typeof schema> & { jwtSecret: string; jwtPreviousSecrets: string[]; publicUrl: string; dataDir: string };

/** Reads and validates the environment once; names every bad variable and exits fast. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = schema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  const c = parsed.data;
  return {
    ...c,
    dataDir,
    jwtSecret: c.JWT_SECRET ?? persistentSecret('jwt-secret'),
    jwtPreviousSecrets: c.JWT_PREVIOUS_SECRETS.split(',').map((x) => x.trim()).filter((x) => x.length >= 32),
    publicUrl: (c.PUBLIC_URL ?? `http://${c.HOST}:${c.PORT}`).replace(/\/$/, ''),
  };
}

/** A random secret generated on first start and kept in .data/ so restarts keep sessions valid. */
export function persistentSecret(name: string): string {
  const file = path.join(dataDir, name);
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}
