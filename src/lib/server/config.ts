import { z } from 'zod';

// Every setting the server reads, declared once and validated when the server starts.
// Local defaults suit `npm start`; scripts/serve.ts fills in the generated secrets.
const schema = z.object({
  APP_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PUBLIC_ORIGIN: z.url().default('http://localhost:4321'),
  DATABASE_URL: z.string().regex(/^postgres(ql)?:\/\//, 'must be a postgres:// connection string'),
  DATABASE_POOL_SIZE: z.coerce.number().int().min(1).max(100).default(10),
  /**
   * Read-only connection strings of streaming replicas, separated by commas: reads that may be a
   * moment behind go there (the primary serves them when every replica is down).
   */
  DATABASE_REPLICA_URLS: z
    .string()
    .default('')
    .transform((s) =>
      s
        .split(',')
        .map((u) => u.trim())
        .filter((u) => u !== ''),
    )
    .pipe(
      z.array(z.string().regex(/^postgres(ql)?:\/\//, 'must be postgres:// connection strings')),
    ),
  AUTH_SECRET: z.string().min(32, 'must be at least 32 characters'),
  S3_ENDPOINT: z.url().default('http://127.0.0.1:4580'),
  S3_REGION: z.string().default('us-east-1'),
  S3_BUCKET: z
    .string()
    .regex(/^[a-z0-9][a-z0-9.-]{2,62}$/, 'must be a valid bucket name')
    .default('edgewise-raw'),
  S3_ACCESS_KEY_ID: z.string().default('S3RVER'),
  S3_SECRET_ACCESS_KEY: z.string().default('S3RVER'),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2526),
  MAIL_FROM: z.string().default('Edgewise <no-reply@edgewise.test>'),
  /** Folder where the local SMTP fake keeps captured mail; enables the dev mail page. */
  MAIL_CAPTURE_DIR: z.string().optional(),
  /** Trust X-Forwarded-For for the client address only behind a known proxy. */
  TRUST_PROXY: z.stringbool().default(false),
  /** Requests that send e-mail (sign-up, password reset, sign-in link) per client address per hour. */
  MAIL_LIMIT_PER_CLIENT: z.coerce.number().int().positive().default(20),
  /** Answer searches from the in-memory index (`off`: every search goes to SQL, as a comparison). */
  SEARCH_INDEX: z.enum(['on', 'off']).default('on'),
  MAX_UPLOAD_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(200 * 1024 * 1024),
  /** Largest file POST /api/v1/analyses takes in one request (bigger files go through uploads). */
  MAX_ANALYSIS_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(64 * 1024 * 1024),
  /** Least severe log level written (pino's levels). */
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
  /** `json` lines for collectors, `pretty` for people; `auto` is pretty on a terminal only. */
  LOG_FORMAT: z.enum(['auto', 'json', 'pretty']).default('auto'),
});

export type Config = z.infer<typeof schema>;

export class ConfigError extends Error {}

/** Parses an environment; throws ConfigError naming each missing or bad variable. */
export function parseConfig(env: Record<string, string | undefined>): Config {
  const result = schema.safeParse(env);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new ConfigError(`Edgewise configuration is invalid:\n${lines.join('\n')}`);
  }
  return result.data;
}

/** The log settings alone: the logger must work before (and whether or not) the rest is valid. */
export function logConfig(): Pick<Config, 'LOG_LEVEL' | 'LOG_FORMAT'> {
  return schema.pick({ LOG_LEVEL: true, LOG_FORMAT: true }).parse(process.env);
}

let cached: Config | undefined;

/** The process's configuration, parsed from process.env on first use. */
export function config(): Config {
  cached ??= parseConfig(process.env);
  return cached;
}
