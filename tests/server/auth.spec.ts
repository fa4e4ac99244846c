import { eq } from 'drizzle-orm';
import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { mailMessage } from '../../server/db/schema.js';
import { createTestApp, signUp, TEST_PASSWORD, type TestApp } from './helpers/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => t.reset());

/** Polls the outbox table: the catcher stores a message a moment after the mailer returns. */
async function mailTo(email: string): Promise<{ subject: string; text: string }> {
  for (let i = 0; i < 50; i++) {
    const rows = await t.database.db.select().from(mailMessage).where(eq(mailMessage.to, email));
    if (rows[0]) return rows[0];
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${email}`);
}

describe('accounts', () => {
  it('signs up, gets a session and a personal workspace where the new user is admin', async () => {
    const { agent } = await signUp(t, 'rider@lab.test', 'Rider One');
    const me = await agent.get('/api/me').expect(200);
    expect(me.body.user).toMatchObject({ email: 'rider@lab.test', name: 'Rider One' });
    expect(me.body.workspaces).toHaveLength(1);
    expect(me.body.workspaces[0]).toMatchObject({ role: 'admin', personal: true });
  });

  it('sets the session cookie HttpOnly and SameSite=Lax, without Secure on http', async () => {
    const res = await supertest(t.app)
      .post('/api/auth/sign-up/email')
      .send({ email: 'cookie@lab.test', password: TEST_PASSWORD, name: 'Cookie' })
      .expect(200);
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((c) => c.includes('session_token'));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i);
  });

  it('refuses a wrong password and a second account on the same e-mail', async () => {
    await signUp(t, 'rider@lab.test');
    await supertest(t.app).post('/api/auth/sign-in/email').send({ email: 'rider@lab.test', password: 'not-it-at-all' }).expect(401);
    const again = await supertest(t.app)
      .post('/api/auth/sign-up/email')
      .send({ email: 'rider@lab.test', password: TEST_PASSWORD, name: 'Twin' });
    expect(again.status).toBeGreaterThanOrEqual(400);
    expect(again.status).toBeLessThan(500);
  });

  it('signs in and out; after sign-out the cookie no longer works', async () => {
    await signUp(t, 'rider@lab.test');
    const agent = supertest.agent(t.app);
    await agent.post('/api/auth/sign-in/email').send({ email: 'rider@lab.test', password: TEST_PASSWORD }).expect(200);
    await agent.get('/api/me').expect(200);
    await agent.post('/api/auth/sign-out').set('Origin', 'http://localhost:3000').send({}).expect(200);
    const after = await agent.get('/api/me').expect(401);
    expect(after.body.error.code).toBe('unauthenticated');
  });

  it('resets a password through the link in the mail, and the old password stops working', async () => {
    await signUp(t, 'forgetful@lab.test');
    await supertest(t.app)
      .post('/api/auth/request-password-reset')
      .send({ email: 'forgetful@lab.test', redirectTo: 'http://localhost:3000/reset-password' })
      .expect(200);
    const mail = await mailTo('forgetful@lab.test');
    expect(mail.subject).toBe('Reset your Cogbook password');
    const link = /(http:\/\/localhost:3000\/api\/auth\/reset-password\/\S+)/.exec(mail.text)?.[1];
    expect(link).toBeDefined();

    // Following the link redirects to the app's page with the token in the query.
    const follow = await supertest(t.app).get(new URL(link!).pathname + new URL(link!).search).expect(302);
    const target = new URL(follow.headers.location!);
    expect(target.pathname).toBe('/reset-password');
    const token = target.searchParams.get('token');
    expect(token).toBeTruthy();

    await supertest(t.app).post('/api/auth/reset-password').send({ token, newPassword: 'brand-new-pass-2' }).expect(200);
    await supertest(t.app).post('/api/auth/sign-in/email').send({ email: 'forgetful@lab.test', password: TEST_PASSWORD }).expect(401);
    await supertest(t.app).post('/api/auth/sign-in/email').send({ email: 'forgetful@lab.test', password: 'brand-new-pass-2' }).expect(200);
    // A used token is refused.
    const reuse = await supertest(t.app).post('/api/auth/reset-password').send({ token, newPassword: 'third-pass-333' });
    expect(reuse.status).toBe(400);
  });

  it('limits sign-in attempts per client address', async () => {
    const limited = t.appWith({ signInLimit: 3 });
    const tries = [];
    for (let i = 0; i < 4; i++) {
      tries.push((await supertest(limited.app).post('/api/auth/sign-in/email').send({ email: 'x@lab.test', password: 'wrong-pass-1' })).status);
    }
    expect(tries.slice(0, 3)).toEqual([401, 401, 401]);
    expect(tries[3]).toBe(429);
    // Another address is not affected: the key is the client address.
    const other = await supertest(limited.app).post('/api/auth/sign-in/email').set('X-Forwarded-For', '203.0.113.9').send({ email: 'x@lab.test', password: 'wrong-pass-1' });
    expect(other.status).toBe(429); // trust proxy is off: a forged header does not buy a new bucket
  });
});
