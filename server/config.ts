import { z } from 'zod';
import path from 'node:path';

const environmentSchema = z.object({
  PORT: z.coerce.number().int().min(0).max(65535).default(4300),
  TUTTI_DATA_DIR: z.string().min(1).default('./data'),
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, 'DATABASE_URL must start with postgres:// or postgresql://')
    .optional(),
  OIDC_ISSUER: z.url().default('http://127.0.0.1:4310'),
  OIDC_CLIENT_ID: z.string().min(1).default('tuttiboard'),
  OIDC_CLIENT_SECRET: z.string().min(1).default('tuttiboard-local-secret'),
  SMTP_URL: z
    .string()
    .regex(/^smtps?:\/\//, 'SMTP_URL must start with smtp:// or smtps://')
    .default('smtp://127.0.0.1:2525'),
  MAIL_FROM: z.string().min(3).default('Tuttiboard <tuttiboard@localhost>'),
  APP_URL: z.url().optional(),
  SESSION_SECRET: z.string().min(16).optional(),
  TRUST_PROXY: z.enum(['true', 'false']).default('false'),
  RATE_LIMIT_SIGN_IN: z.coerce.number().int().min(1).default(40),
  RATE_LIMIT_TOKEN: z.coerce.number().int().min(1).default(1200),
  RATE_LIMIT_TOKEN_FAILURES: z.coerce.number().int().min(1).default(30),
  PAYMENTS_SECRET_KEY: z.string().min(8).optional(),
  PAYMENTS_WEBHOOK_SECRET: z.string().min(8).optional(),
  PAYMENTS_API_URL: z.url().optional(),
  TUTTI_SECRET_KEY: z
    .string()
    .min(32, 'TUTTI_SECRET_KEY must be at least 32 characters')
    .optional(),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

/** Settings the server runs with; every field has a default that starts the local fakes. */
export interface Config {
  port: number;
  dataDir: string;
  databaseUrl?: string;
  oidcIssuer: string;
  oidcClientId: string;
  oidcClientSecret: string;
  smtpUrl: string;
  mailFrom: string;
  /** The address people open the app at; sign-in redirects come back here. */
  appUrl: string;
  /** Whether APP_URL was set; otherwise redirects follow the address of each request. */
  appUrlIsFixed: boolean;
  sessionSecret?: string;
  trustProxy: boolean;
  logLevel: z.infer<typeof environmentSchema>['LOG_LEVEL'];
  /**
   * The hosted payment service, when PAYMENTS_SECRET_KEY is set: the secret API key, the webhook
   * signing secret, and the API's address (the SDK's default when PAYMENTS_API_URL is unset).
   */
  payments?: { secretKey: string; webhookSecret: string; apiUrl?: string };
  /**
   * The key (TUTTI_SECRET_KEY) that encrypts secrets kept in the database, such as the OneRoster
   * sync's client secret; without it such secrets cannot be saved.
   */
  secretKey?: string;
  /** Requests per minute: sign-ins per address, uses per token, failed tokens per address. */
  rateLimits: { signIn: number; token: number; tokenFailures: number };
}

/** Reads and checks the environment; throws with every problem listed when a value is wrong. */
export function loadConfig(environment: NodeJS.ProcessEnv = process.env): Config {
  const parsed = environmentSchema.safeParse(environment);
  if (!parsed.success) {
    const problems = parsed.error.issues.map(
      (issue) => `${issue.path.join('.')}: ${issue.message}`,
    );
    throw new Error(
      `The environment has settings Tuttiboard cannot use:\n  ${problems.join('\n  ')}`,
    );
  }
  const values = parsed.data;
  if (values.PAYMENTS_SECRET_KEY && !values.PAYMENTS_WEBHOOK_SECRET) {
    throw new Error(
      "The environment has settings Tuttiboard cannot use:\n  PAYMENTS_WEBHOOK_SECRET: needed with PAYMENTS_SECRET_KEY, to check the service's signed events",
    );
  }
  return {
    port: values.PORT,
    dataDir: path.resolve(values.TUTTI_DATA_DIR),
    databaseUrl: values.DATABASE_URL,
    oidcIssuer: values.OIDC_ISSUER.replace(/\/$/, ''),
    oidcClientId: values.OIDC_CLIENT_ID,
    oidcClientSecret: values.OIDC_CLIENT_SECRET,
    smtpUrl: values.SMTP_URL,
    mailFrom: values.MAIL_FROM,
    appUrl: (values.APP_URL ?? `http://localhost:${values.PORT}`).replace(/\/$/, ''),
    appUrlIsFixed: values.APP_URL !== undefined,
    sessionSecret: values.SESSION_SECRET,
    trustProxy: values.TRUST_PROXY === 'true',
    logLevel: values.LOG_LEVEL,
    secretKey: values.TUTTI_SECRET_KEY,
    payments: values.PAYMENTS_SECRET_KEY
      ? {
          secretKey: values.PAYMENTS_SECRET_KEY,
          webhookSecret: values.PAYMENTS_WEBHOOK_SECRET!,
          apiUrl: values.PAYMENTS_API_URL?.replace(/\/$/, ''),
        }
      : undefined,
    rateLimits: {
      signIn: values.RATE_LIMIT_SIGN_IN,
      token: values.RATE_LIMIT_TOKEN,
      tokenFailures: values.RATE_LIMIT_TOKEN_FAILURES,
    },
  };
}
