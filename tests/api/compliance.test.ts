import dayjs from 'dayjs';
import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startSmtpFake, type SmtpFakeHandle } from '../../fakes/smtp/server.js';
import { OutboxMessage } from '../../server/db/models/index.js';
import { createMailer } from '../../server/integrations/mailer.js';
import { deliverDue } from '../../server/services/outbox.js';
import { as, demo } from '../fixtures/auth.js';
import { makeAcidLot, makeResult, makeSite } from '../fixtures/bench.js';
import { apiTestApp } from '../setup/db.js';

let smtp: SmtpFakeHandle;
let ctx: ReturnType<typeof apiTestApp>;
let site: Awaited<ReturnType<typeof makeSite>>;
let lot: { id: number };
let permitId: number;
let officer: { email: string; password: string };
const REGULATOR = 'regulator@state.example';

beforeAll(async () => {
  smtp = await startSmtpFake({ smtpPort: 0, mailboxPort: 0 });
  ctx = apiTestApp({ SMTP_PORT: String(smtp.smtpPort) });
  const { app } = ctx;
  site = await makeSite(app);
  lot = await makeAcidLot(app);
  const admin = await as(app, demo.admin);
  const u = await admin.post('/api/v1/users', { email: `co-${Date.now()}@utility.example`, name: 'Test Officer', role: 'compliance_officer', organizationId: site.facility.organizationId });
  officer = { email: u.body.user.email, password: u.body.temporaryPassword };
  const permit = await admin.post('/api/v1/permits', {
    facilityId: site.facility.id,
    number: `TP-${Date.now()}`,
    issuingAuthority: 'Test authority',
    effectiveFrom: '2026-01-01',
    regulatorContacts: [{ name: 'Permit Desk', email: REGULATOR }],
    followUpText: 'Resample within 24 hours.',
    followUpDeadlineValue: 24,
    followUpDeadlineUnit: 'hours',
  });
  permitId = permit.body.id;
  const limit = await admin.post(`/api/v1/permits/${permitId}/limits`, {
    pointId: site.point.id, parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', value: '50', units: 'mg/L as CaCO3', significantFigures: 2, effectiveFrom: '2026-01-01',
  });
  expect(limit.status).toBe(201);
});
afterAll(async () => {
  await ctx.sequelize.close();
  await smtp.close();
});

const day = (n: number) => dayjs('2026-11-02T15:00:00Z').add(n, 'day');

/** Logs, submits and approves one alkalinity result of `titreMl` × 0.0200 N × 50,000 / 100 mL. */
async function approvedResult(titreMl: number, when: dayjs.Dayjs) {
  const { app } = ctx;
  const { titration } = await makeResult(app, demo.analyst, { pointId: site.point.id, titrantId: lot.id, analysedAt: when, titreMl });
  const analyst = await as(app, demo.analyst);
  const sub = await analyst.post(`/api/v1/titrations/${titration.id}/submit`, { version: titration.version });
  expect(sub.status, JSON.stringify(sub.body)).toBe(200);
  const ok = await analyst.post(`/api/v1/titrations/${titration.id}/approve`, { version: sub.body.version });
  expect(ok.status, JSON.stringify(ok.body)).toBe(200);
  return ok.body;
}

async function exceedances() {
  const admin = await as(ctx.app, demo.admin);
  return (await admin.get(`/api/v1/exceedances?facilityId=${site.facility.id}&pageSize=50&sort=periodStart`)).body.items as Array<Record<string, any>>;
}

const makeDue = () => OutboxMessage.update({ nextAttemptAt: new Date(Date.now() - 1000) }, { where: { status: 'pending' } });

describe('approval → exceedance → notice', () => {
  let first: Record<string, any>;

  it('creates one exceedance and one notice when an approved result breaks a daily minimum', async () => {
    // 4.00 mL × 0.0200 N × 50,000 / 100 mL = 40 mg/L (SM 2320 B) against a daily minimum of 50 mg/L
    first = await approvedResult(4.0, day(0));
    const list = await exceedances();
    expect(list).toHaveLength(1);
    expect(list[0]).toMatchObject({ parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', reported: '40', periodStart: '2026-11-02', status: 'open' });
    expect(list[0].notices).toHaveLength(1);
    expect(list[0].notices[0].recipients).toEqual(expect.arrayContaining([REGULATOR, officer.email]));
  });

  it('delivers the notice to the fake mailbox with the recipients and the figures', async () => {
    const mailer = createMailer(ctx.config);
    await deliverDue(ctx.config, mailer);
    mailer.close();
    const m = await smtp.waitForMessage((x) => (x.subject ?? "").includes('2026-11-02'));
    expect(m.to).toEqual(expect.arrayContaining([REGULATOR, officer.email]));
    expect(m.text).toContain('40 mg/L as CaCO3');
    expect(m.text).toContain('at least 50 mg/L as CaCO3');
    expect(m.text).toContain('Resample within 24 hours.');
    expect(m.text).toMatch(/regulator’s rules govern/);
    expect((await exceedances())[0].status).toBe('notified');
  });

  it('keeps the notice while SMTP is down and delivers it exactly once when it is back', async () => {
    const mailer = createMailer(ctx.config);
    await smtp.suspendSmtp();
    await approvedResult(4.2, day(1)); // 42 mg/L on 2026-11-03
    const r1 = await deliverDue(ctx.config, mailer);
    expect(r1.failed).toBeGreaterThanOrEqual(1);
    const queued = (await exceedances()).find((e) => e.periodStart === '2026-11-03')!;
    expect(queued.notices[0].delivery.status).toBe('pending');
    await smtp.resumeSmtp();
    await makeDue();
    await deliverDue(ctx.config, mailer);
    await makeDue();
    await deliverDue(ctx.config, mailer);
    mailer.close();
    expect(smtp.messages().filter((m) => (m.subject ?? "").includes('2026-11-03'))).toHaveLength(1);
  });

  it('closes an exceedance that an amendment cures, and says so', async () => {
    const analyst = await as(ctx.app, demo.analyst);
    // 5.20 mL → 52 mg/L: the day's value now meets the 50 mg/L minimum
    const amend = await analyst.post(`/api/v1/titrations/${first.id}/amend`, { reason: 'Burette misread: 5.20 mL, not 4.00 mL', volumeToTotalEndpointMl: 5.2, version: first.version });
    expect(amend.status, JSON.stringify(amend.body)).toBe(201);
    const sub = await analyst.post(`/api/v1/titrations/${amend.body.id}/submit`, { version: amend.body.version });
    const ok = await analyst.post(`/api/v1/titrations/${amend.body.id}/approve`, { version: sub.body.version });
    expect(ok.status).toBe(200);
    const cured = (await exceedances()).find((e) => e.periodStart === '2026-11-02')!;
    expect(cured.status).toBe('closed');
    expect(cured.closedReason).toMatch(/Cured/);
    expect(cured.notices.map((n: { kind: string }) => n.kind)).toEqual(['exceedance', 'cured']);
    // the other day's exceedance is untouched
    expect((await exceedances()).find((e) => e.periodStart === '2026-11-03')!.status).not.toBe('closed');
  });

  it('reports the month on GET /compliance with the limit’s value, count and status', async () => {
    const admin = await as(ctx.app, demo.admin);
    const res = await admin.get(`/api/v1/compliance?facilityId=${site.facility.id}&month=2026-11`);
    expect(res.status).toBe(200);
    const limit = res.body.limits[0];
    expect(limit).toMatchObject({ parameter: 'total_alkalinity', statistic: 'daily', bound: 'minimum', status: 'exceeded', exceedanceCount: 1, sampleCount: 2 });
    expect(limit.reported).toBe('42');
    expect(res.body.exceedances.length).toBe(2);
    const bad = await admin.get(`/api/v1/compliance?facilityId=${site.facility.id}&month=2026-13`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty('month');
  });
});

describe('signed notice links', () => {
  const linkOf = (text: string) => /\/public\/notices\/([\w.-]+)/.exec(text)![1];

  it('opens without signing in, and refuses a tampered or expired token', async () => {
    const m = smtp.messages().find((x) => (x.subject ?? "").includes('2026-11-02') && !(x.subject ?? "").includes('no longer'))!;
    const token = linkOf(m.text ?? "");
    const ok = await request(ctx.app).get(`/api/v1/public/notices/${token}`);
    expect(ok.status).toBe(200);
    expect(ok.body.exceedance).toMatchObject({ reported: '40', units: 'mg/L as CaCO3' });
    const tampered = token.slice(0, -3) + (token.endsWith('abc') ? 'xyz' : 'abc');
    expect((await request(ctx.app).get(`/api/v1/public/notices/${tampered}`)).status).toBe(404);
    const { n } = jwt.decode(token) as { n: number };
    const expired = jwt.sign({ n, exp: Math.floor(Date.now() / 1000) - 10 }, ctx.config.jwtSecret, { audience: 'notice', issuer: 'titrata' });
    expect((await request(ctx.app).get(`/api/v1/public/notices/${expired}`)).status).toBe(404);
  });
});

describe('acknowledging', () => {
  it('lets the utility’s compliance officer acknowledge with the corrective action, and nobody else', async () => {
    const open = (await exceedances()).find((e) => e.periodStart === '2026-11-03')!;
    const otherCo = await as(ctx.app, demo.compliance);
    expect((await otherCo.post(`/api/v1/exceedances/${open.id}/acknowledge`, { correctiveAction: 'x' })).status).toBe(404);
    const admin = await as(ctx.app, demo.admin);
    expect((await admin.post(`/api/v1/exceedances/${open.id}/acknowledge`, { correctiveAction: 'x' })).status).toBe(403);
    const login = await request(ctx.app).post('/api/v1/auth/login').send(officer);
    const auth = { Authorization: `Bearer ${login.body.token}` };
    const empty = await request(ctx.app).post(`/api/v1/exceedances/${open.id}/acknowledge`).set(auth).send({});
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields).toHaveProperty('correctiveAction');
    const ack = await request(ctx.app).post(`/api/v1/exceedances/${open.id}/acknowledge`).set(auth).send({ correctiveAction: 'Raised caustic feed; resampled next day at 61 mg/L.' });
    expect(ack.status).toBe(200);
    expect(ack.body).toMatchObject({ status: 'acknowledged', correctiveAction: expect.stringContaining('caustic') });
    const closed = await request(ctx.app).post(`/api/v1/exceedances/${open.id}/close`).set(auth).send({ reason: 'Written explanation sent to the permits desk.' });
    expect(closed.body.status).toBe('closed');
  });
});

describe('early warning', () => {
  it('projects a monthly average heading below its minimum and e-mails opted-in officers once per period', async () => {
    const { app } = ctx;
    const { checkProjectionAlerts } = await import('../../server/services/compliance.js');
    const s2 = await makeSite(app);
    const admin = await as(app, demo.admin);
    const u = await admin.post('/api/v1/users', { email: `co2-${Date.now()}@utility.example`, name: 'Second Officer', role: 'compliance_officer', organizationId: s2.facility.organizationId });
    const permit = await admin.post('/api/v1/permits', { facilityId: s2.facility.id, number: `EW-${Date.now()}`, issuingAuthority: 'Test authority', effectiveFrom: '2026-01-01', regulatorContacts: [{ name: 'Desk', email: REGULATOR }] });
    await admin.post(`/api/v1/permits/${permit.body.id}/limits`, { pointId: s2.point.id, parameter: 'total_alkalinity', statistic: 'monthly_average', bound: 'minimum', value: '60', units: 'mg/L as CaCO3', significantFigures: 2, effectiveFrom: '2026-01-01' });
    // 4.00 mL → 40 mg/L (SM 2320 B) just now: at the current mean the monthly average will be 40 against a minimum of 60
    const now = dayjs();
    const { titration } = await makeResult(app, demo.analyst, { pointId: s2.point.id, titrantId: lot.id, analysedAt: now, titreMl: 4.0, sample: { collectedAt: now.subtract(1, 'minute').toISOString() } });
    const analyst = await as(app, demo.analyst);
    const sub = await analyst.post(`/api/v1/titrations/${titration.id}/submit`, { version: titration.version });
    await analyst.post(`/api/v1/titrations/${titration.id}/approve`, { version: sub.body.version });

    const login = await request(app).post('/api/v1/auth/login').send({ email: u.body.user.email, password: u.body.temporaryPassword });
    const auth = { Authorization: `Bearer ${login.body.token}` };
    const month = await request(app).get(`/api/v1/compliance?facilityId=${s2.facility.id}&month=${now.format('YYYY-MM')}`).set(auth);
    const p = month.body.projections.find((x: { crossesLimit: boolean }) => x.crossesLimit);
    expect(p.sentence).toMatch(/At the current mean the monthly average will be 40 mg\/L as CaCO3 against a minimum of 60 mg\/L as CaCO3\./);

    expect((await request(app).post('/api/v1/projection-alerts').set(auth).send({})).status).toBe(400);
    const optIn = await request(app).post('/api/v1/projection-alerts').set(auth).send({ facilityId: s2.facility.id });
    expect(optIn.status).toBe(201);
    const first = await checkProjectionAlerts();
    expect(first).toBeGreaterThanOrEqual(1);
    expect(await checkProjectionAlerts()).toBe(0);
    const queued = await OutboxMessage.findAll({ where: { dedupeKey: { [(await import('sequelize')).Op.like]: `projection:${login.body.user.id}:%` } } });
    expect(queued).toHaveLength(1);
    expect(queued[0].toAddresses).toEqual([u.body.user.email]);
    expect(queued[0].textBody).toContain('not an exceedance');
  });
});
