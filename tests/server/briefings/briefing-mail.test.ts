// Mail through a real SMTP conversation on loopback: nodemailer → the fake SMTP server
// (smtp-server), which keeps the messages. The distribution message's attachment is the signed
// PDF, byte for byte, and still verifies after the trip.
import { CAUTION_LINE } from '../../../shared/api/caution';
import { createHash } from 'node:crypto';
import nodemailer from 'nodemailer';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeSmtpServer, type FakeSmtpServer } from '../../../server/services/briefings/mail/fake-smtp-server';
import { attachmentName, BRIEFING_HEADER, createMailer, distributionMessage, signOffRequestMessage, type Mailer } from '../../../server/services/briefings/mail/mailer';
import { decodeEncodedWords, parseMessage, parseParameters } from '../../../server/services/briefings/mail/parse-message';
import { signBriefing } from '../../../server/services/briefings/sign-briefing';
import { generateOrganizationCertificate } from '../../../server/services/briefings/signing/organization-certificate';
import { verifyPdf } from '../../../server/services/briefings/signing/verify-pdf';
import { briefingInput, signer } from '../../fixtures/briefing/demo-town-briefing';

const from = 'Cutline <briefings@cutline.example>';
const ref = {
  briefingId: '3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08',
  version: 1,
  organizationName: 'Demo Emergency Management Office',
  planName: 'Larkmoor river evacuation',
  scenarioName: 'Evening order, dry roads',
};

let smtp: FakeSmtpServer;
let mailer: Mailer;
const stored: number[] = [];

beforeAll(async () => {
  smtp = await startFakeSmtpServer({ onMessage: (m) => void stored.push(m.id) });
  mailer = createMailer({ smtpUrl: smtp.url, from });
});
afterAll(async () => {
  mailer.close();
  await smtp.close();
});

describe('the fake SMTP server', () => {
  it('listens on loopback only', async () => {
    expect(smtp.url).toMatch(/^smtp:\/\/127\.0\.0\.1:\d+$/);
    await expect(startFakeSmtpServer({ host: '0.0.0.0' as '127.0.0.1' })).rejects.toThrow(/loopback only/);
  });

  it('receives the sign-off request with the review link', async () => {
    const sent = await mailer.sendSignOffRequest({
      ...ref,
      to: [{ name: 'Mina Ashcombe', email: 'official@cutline.example' }],
      requestedBy: { name: 'Tomas Everly', email: 'planner@cutline.example' },
      reviewUrl: 'http://127.0.0.1:3000/briefings/3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08/review',
      note: 'Bridges & ramps <as discussed>',
    });
    expect(sent.accepted).toEqual(['official@cutline.example']);
    const m = await smtp.waitFor((x) => x.parsed.subject?.startsWith('Sign-off requested') ?? false);
    expect(m.envelopeFrom).toBe('briefings@cutline.example');
    expect(m.envelopeTo).toEqual(['official@cutline.example']);
    expect(m.parsed.subject).toBe('Sign-off requested: Larkmoor river evacuation — Evening order, dry roads');
    expect(m.parsed.to).toBe('Mina Ashcombe <official@cutline.example>');
    expect(m.parsed.text).toContain('Review it in Cutline: http://127.0.0.1:3000/briefings/3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08/review');
    expect(m.parsed.text).toContain('Their note: Bridges & ramps <as discussed>');
    expect(m.parsed.html).toContain('href="http://127.0.0.1:3000/briefings/3c9f0e6a-5b2d-4a17-8e4c-7d1b2a9f6e08/review"');
    expect(m.parsed.html).toContain('Bridges &amp; ramps &lt;as discussed&gt;');
    expect(m.parsed.attachments).toEqual([]);
    // The sign-off request carries the caution too (a planning aid; defer to the plan, codes, engineer).
    expect(m.parsed.text).toContain(CAUTION_LINE);
    expect(m.parsed.html).toContain('licensed traffic engineer');
    expect(m.parsed.headers).toContainEqual([BRIEFING_HEADER.toLowerCase(), ref.briefingId]);
    expect(stored).toContain(m.id);
  });

  it('receives the distribution message with the signed PDF attached, unaltered and still verifying', async () => {
    const certificate = generateOrganizationCertificate({
      organizationName: ref.organizationName,
      passphrase: 'mail test passphrase',
      // Issued just before the fixed signing time below, so the signature verifies on any later day.
      now: new Date('2026-12-02T14:00:00Z'),
    });
    const signed = await signBriefing(briefingInput(), signer, certificate, new Date('2026-12-02T14:05:33Z'));
    await mailer.sendDistribution({
      ...ref,
      to: [
        { name: 'Council Clerk', email: 'clerk@cutline.example' },
        { name: 'Fire Chief', email: 'fire@cutline.example' },
      ],
      signedBy: { ...signer, signedAt: signed.signedAt },
      pdf: signed.pdf,
      fileSha256: signed.fileSha256,
      verificationUrl: 'http://127.0.0.1:3000/verify',
      timeZone: 'UTC',
    });
    const m = await smtp.waitFor((x) => x.parsed.subject?.startsWith('Signed briefing') ?? false);
    expect(m.envelopeTo).toEqual(['clerk@cutline.example', 'fire@cutline.example']);
    expect(m.parsed.text).toContain('Mina Ashcombe, Emergency Management Director, signed it on 2 December 2026, 14:05 UTC.');
    expect(m.parsed.text).toContain(`SHA-256 of the attached file: ${signed.fileSha256}`);
    expect(m.parsed.text).toContain(CAUTION_LINE);
    expect(m.parsed.attachments).toHaveLength(1);
    const [a] = m.parsed.attachments;
    expect(a).toMatchObject({ filename: 'briefing-larkmoor-river-evacuation-v1-3c9f0e6a.pdf', contentType: 'application/pdf', size: signed.pdf.length, sha256: signed.fileSha256 });
    expect(a!.content.equals(signed.pdf)).toBe(true);
    expect(createHash('sha256').update(a!.content).digest('hex')).toBe(signed.fileSha256);
    expect(verifyPdf(a!.content, [certificate.certificatePem]).valid).toBe(true);
  });

  it('answers 451 when the message cannot be kept, so the sender knows', async () => {
    const failing = await startFakeSmtpServer({ onMessage: () => Promise.reject(new Error('database down')) });
    const t = nodemailer.createTransport(failing.url);
    try {
      await expect(t.sendMail({ from, to: 'a@cutline.example', subject: 'x', text: 'y' })).rejects.toThrow(/451/);
      expect(failing.messages()).toEqual([]);
    } finally {
      t.close();
      await failing.close();
    }
  });
});

describe('message builders', () => {
  it('refuse a review link that is not a web address', () => {
    expect(() =>
      signOffRequestMessage({ ...ref, to: [{ name: 'A', email: 'a@cutline.example' }], requestedBy: { name: 'B', email: 'b@cutline.example' }, reviewUrl: 'javascript:alert(1)' }, from),
    ).toThrow(/not a web address/);
  });

  it('name the attachment after the plan in plain ASCII', () => {
    expect(attachmentName({ ...ref, planName: 'Évacuation: Île Nord / 2026' })).toBe('briefing-evacuation-ile-nord-2026-v1-3c9f0e6a.pdf');
    const msg = distributionMessage(
      { ...ref, to: [{ name: 'A', email: 'a@cutline.example' }], signedBy: { ...signer, signedAt: new Date() }, pdf: Buffer.from('%PDF-'), fileSha256: 'x', verificationUrl: 'https://cutline.example/verify', timeZone: 'UTC' },
      from,
    );
    expect(msg.attachments?.[0]?.contentType).toBe('application/pdf');
  });
});

describe('the message reader', () => {
  it('decodes encoded words split inside a multi-byte character (RFC 2047)', () => {
    // "é" is C3 A9 in UTF-8; a sender may cut between the two bytes.
    expect(decodeEncodedWords('=?UTF-8?Q?caf=C3?= =?UTF-8?Q?=A9_au_lait?=')).toBe('café au lait');
    expect(decodeEncodedWords('=?UTF-8?B?w4lsaXNl?= Nord')).toBe('Élise Nord');
    expect(decodeEncodedWords('=?ISO-8859-1?Q?Gr=FC=DFe?=')).toBe('Grüße');
  });

  it('joins RFC 2231 parameter continuations', () => {
    const p = parseParameters(`attachment; filename*0*=utf-8''%C3%89vac; filename*1*=uation.pdf`);
    expect(p.value).toBe('attachment');
    expect(p.params.get('filename')).toBe('Évacuation.pdf');
    expect(parseParameters('multipart/mixed; boundary="--_b=1"').params.get('boundary')).toBe('--_b=1');
  });

  it('reads a hand-written multipart message', () => {
    const raw = Buffer.from(
      [
        'From: A <a@cutline.example>',
        'To: B <b@cutline.example>',
        'Subject: =?UTF-8?Q?Hello_=E2=80=94_there?=',
        'Content-Type: multipart/mixed; boundary="XYZ"',
        '',
        '--XYZ',
        'Content-Type: text/plain; charset=utf-8',
        'Content-Transfer-Encoding: quoted-printable',
        '',
        'Line one =E2=80=94 soft=',
        'wrapped',
        '--XYZ',
        'Content-Type: application/octet-stream; name="data.bin"',
        'Content-Transfer-Encoding: base64',
        '',
        'AAECAwQ=',
        '--XYZ--',
        '',
      ].join('\r\n'),
    );
    const m = parseMessage(raw);
    expect(m.subject).toBe('Hello — there');
    expect(m.text).toBe('Line one — softwrapped');
    expect(m.attachments).toHaveLength(1);
    expect(m.attachments[0]).toMatchObject({ filename: 'data.bin', size: 5 });
    expect([...m.attachments[0]!.content]).toEqual([0, 1, 2, 3, 4]);
  });
});
