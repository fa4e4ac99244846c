import MailComposer from 'nodemailer/lib/mail-composer';
import { describe, expect, it } from 'vitest';
import { readMime } from '../../../server/mail/read-mime.js';

/** nodemailer's own composer writes the MIME, so the reader is checked against the real encoder. */
async function compose(mail: { subject: string; text: string; html?: string }): Promise<string> {
  const message = new MailComposer({ from: 'a@lab.test', to: 'b@lab.test', ...mail }).compile();
  return (await message.build()).toString('utf8');
}

describe('readMime', () => {
  it('reads an encoded subject and a long quoted-printable line unchanged', async () => {
    const url = `http://localhost:3000/api/auth/reset-password/${'t0k3n'.repeat(20)}?callbackURL=%2Freset-password`;
    const text = `Grüße, Jürgen\n\nOpen this link:\n\n${url}\n`;
    const got = readMime(await compose({ subject: 'Zurücksetzen – Cogbook', text }));
    expect(got.subject).toBe('Zurücksetzen – Cogbook');
    expect(got.text.trimEnd()).toBe(text.trimEnd());
    expect(got.html).toBeNull();
  });

  it('reads both parts of a text + HTML message', async () => {
    const got = readMime(await compose({ subject: 'Hello', text: 'plain body', html: '<p>html body</p>' }));
    expect(got.text).toBe('plain body');
    expect(got.html).toBe('<p>html body</p>');
  });
});
