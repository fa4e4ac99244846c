import { betterAuth } from 'better-auth';
import { drizzleAdapter } from 'better-auth/adapters/drizzle';
import type { Config } from './config.js';
import type { Db } from './db/client.js';
import * as schema from './db/schema.js';
import type { Logger } from './logger.js';
import type { Mailer } from './mail/mailer.js';

/** Header the app sets from Express's req.ip (never from the client) for better-auth's IP use. */
export const CLIENT_IP_HEADER = 'x-cogbook-client-ip';

export interface AuthDeps {
  db: Db;
  config: Pick<Config, 'baseUrl' | 'trustedOrigins' | 'authSecret'>;
  mailer: Mailer;
  logger: Logger;
  /** Runs after a new account is stored (creates the personal workspace). */
  onUserCreated: (user: { id: string; name: string; email: string }) => Promise<void>;
}

/**
 * better-auth with e-mail + password, sessions in the database (7 days, refreshed
 * daily), and password reset by e-mail. Telemetry is off.
 */
export function createAuth(deps: AuthDeps) {
  const { config, mailer, logger } = deps;
  return betterAuth({
    appName: 'Cogbook',
    baseURL: config.baseUrl,
    basePath: '/api/auth',
    secret: config.authSecret,
    trustedOrigins: config.trustedOrigins,
    telemetry: { enabled: false },
    database: drizzleAdapter(deps.db, {
      provider: 'pg',
      schema: { user: schema.user, session: schema.session, account: schema.account, verification: schema.verification },
    }),
    emailAndPassword: {
      enabled: true,
      minPasswordLength: 8,
      autoSignIn: true,
      revokeSessionsOnPasswordReset: true,
      resetPasswordTokenExpiresIn: 60 * 60,
      async sendResetPassword({ user, url }) {
        await mailer.send({
          to: user.email,
          subject: 'Reset your Cogbook password',
          text: `Hello ${user.name},\n\nTo choose a new Cogbook password, open this link within one hour:\n\n${url}\n\nIf you did not ask for this, ignore this mail; your password stays as it is.\n`,
        });
      },
    },
    session: { expiresIn: 60 * 60 * 24 * 7, updateAge: 60 * 60 * 24 },
    advanced: {
      useSecureCookies: config.baseUrl.startsWith('https:'),
      ipAddress: { ipAddressHeaders: [CLIENT_IP_HEADER] },
      defaultCookieAttributes: { httpOnly: true, sameSite: 'lax' },
    },
    databaseHooks: {
      user: {
        create: {
          async after(user) {
            await deps.onUserCreated({ id: user.id, name: user.name, email: user.email });
          },
        },
      },
    },
    logger: {
      log(level, message, ...args) {
        logger[level]({ source: 'better-auth', args: args.length ? args : undefined }, message);
      },
    },
  });
}

export type Auth = ReturnType<typeof createAuth>;
