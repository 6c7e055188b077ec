import { z } from 'zod';

const bool = z
  .enum(['1', '0', 'true', 'false', 'yes', 'no', ''])
  .transform((v) => v === '1' || v === 'true' || v === 'yes');

const ConfigSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  DATA_DIR: z.string().default('./data'),
  DATABASE_URL: z.string().optional(),
  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET needs at least 16 characters.').optional(),
  SESSION_IDLE_MINUTES: z.coerce.number().positive().default(30),
  SESSION_ABSOLUTE_HOURS: z.coerce.number().positive().default(12),
  TRUST_PROXY: z.string().optional(),
  COOKIE_SECURE: bool.default(false),
  LOGIN_MAX_PER_IP: z.coerce.number().int().positive().default(30),
  LOGIN_MAX_PER_ACCOUNT: z.coerce.number().int().positive().default(10),
  LOGIN_WINDOW_MINUTES: z.coerce.number().positive().default(15),
  DEMO_PASSWORD: z.string().min(8).default('saltmarsh-demo-26'),
  PUBLIC_URL: z.string().url('PUBLIC_URL must be the address people open, e.g. https://lashline.example.test').optional(),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Lashline <lashline@localhost>'),
  MAIL_CATCHER_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  SCHEDULER: z.enum(['on', 'off']).default('on'),
  SCHEDULE_TZ: z.string().default('Europe/London'),
  DUE_SCAN_CRON: z.string().default('30 5 * * *'),
  DIGEST_CRON: z.string().default('0 7 * * 1'),
  MAIL_RETRY_CRON: z.string().default('* * * * *'),
  BOOKING_SYNC_CRON: z.string().default('*/15 * * * *'),
  LOG_LEVEL: z.enum(['silent', 'error', 'warn', 'info', 'debug']).default('info'),
});

export type Config = z.infer<typeof ConfigSchema>;

export function readConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Lashline cannot start: the environment is not right.\n${lines.join('\n')}`);
  }
  return parsed.data;
}

export function testConfig(over: Partial<Config> = {}): Config {
  return { ...readConfig({}), LOG_LEVEL: 'silent', SCHEDULER: 'off', SESSION_SECRET: 'test-secret-test-secret', ...over };
}
