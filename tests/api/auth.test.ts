import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { apiTestApp } from '../setup/db.js';
import { DEMO_PASSWORD, as, demo, demoRoles } from '../fixtures/auth.js';
import { User } from '../../server/db/models/index.js';
import { LOCK_AFTER_FAILURES } from '../../server/services/auth.js';

const { app, sequelize, config } = apiTestApp();
afterAll(() => sequelize.close());

describe('POST /api/v1/auth/login', () => {
  it.each(Object.entries(demo))('signs in the demo %s with the demo password and the right role', async (key, email) => {
    const res = await request(app).post('/api/v1/auth/login').send({ email, password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.token).toMatch(/^[\w-]+\.[\w-]+\.[\w-]+$/);
    expect(res.body.user).toMatchObject({ email, role: demoRoles[key as keyof typeof demo] });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const me = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${res.body.token}`);
    expect(me.status).toBe(200);
    expect(me.body.email).toBe(email);
  });

  it('answers a wrong password and an unknown e-mail identically (401, same body)', async () => {
    const wrong = await request(app).post('/api/v1/auth/login').send({ email: demo.analyst, password: 'not-the-password' });
    const unknown = await request(app).post('/api/v1/auth/login').send({ email: 'nobody@marrowfield.example', password: 'not-the-password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
    expect(wrong.body.error.code).toBe('unauthenticated');
  });

  it('answers an empty body 400 naming both fields', async () => {
    const res = await request(app).post('/api/v1/auth/login').send({});
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'password']);
  });

  it('answers a malformed e-mail 400 naming the field', async () => {
    const res = await request(app).post('/api/v1/auth/login').send({ email: 'not-an-email', password: 'x' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('email');
  });

  it('refuses a deactivated user with the same 401', async () => {
    const admin = await as(app, demo.admin);
    const me = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${admin.token}`);
    const created = await admin.post('/api/v1/users', { email: 'leaving@marrowfield.example', name: 'Leaving Soon', role: 'analyst', organizationId: me.body.organization.id });
    expect(created.status).toBe(201);
    const temp = created.body.temporaryPassword;
    const ok = await request(app).post('/api/v1/auth/login').send({ email: 'leaving@marrowfield.example', password: temp });
    expect(ok.status).toBe(200);
    const off = await admin.patch(`/api/v1/users/${created.body.user.id}`, { active: false });
    expect(off.status).toBe(200);
    const refused = await request(app).post('/api/v1/auth/login').send({ email: 'leaving@marrowfield.example', password: temp });
    expect(refused.status).toBe(401);
    // the session it already had ends too
    const after = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${ok.body.token}`);
    expect(after.status).toBe(401);
  });

  it('rate-limits sign-in per account with 429', async () => {
    const limited = apiTestApp({ LOGIN_RATE_LIMIT: '3' }, sequelize);
    {
      const codes: number[] = [];
      for (let i = 0; i < 5; i++) {
        codes.push((await request(limited.app).post('/api/v1/auth/login').send({ email: 'rate@limit.example', password: 'x' })).status);
      }
      expect(codes.slice(0, 3)).toEqual([401, 401, 401]);
      expect(codes[3]).toBe(429);
      expect((await request(limited.app).post('/api/v1/auth/login').send({ email: 'rate@limit.example', password: 'x' })).body.error.code).toBe('too_many_requests');
    }
  });

  it(`locks an account after ${LOCK_AFTER_FAILURES} failed sign-ins`, async () => {
    const admin = await as(app, demo.admin);
    const me = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${admin.token}`);
    const created = await admin.post('/api/v1/users', { email: 'lockme@marrowfield.example', name: 'Lock Me', role: 'analyst', organizationId: me.body.organization.id });
    const temp = created.body.temporaryPassword;
    for (let i = 0; i < LOCK_AFTER_FAILURES; i++) {
      expect((await request(app).post('/api/v1/auth/login').send({ email: 'lockme@marrowfield.example', password: 'wrong-password' })).status).toBe(401);
    }
    const locked = await request(app).post('/api/v1/auth/login').send({ email: 'lockme@marrowfield.example', password: temp });
    expect(locked.status).toBe(429);
    // the administrator's reset unlocks it
    const reset = await admin.post(`/api/v1/users/${created.body.user.id}/reset-password`);
    expect((await request(app).post('/api/v1/auth/login').send({ email: 'lockme@marrowfield.example', password: reset.body.temporaryPassword })).status).toBe(200);
  });
});

describe('bearer tokens', () => {
  it('refuses a tampered token', async () => {
    const { token } = await as(app, demo.operator);
    const [h, p, s] = token.split('.');
    const payload = JSON.parse(Buffer.from(p, 'base64url').toString());
    const forged = Buffer.from(JSON.stringify({ ...payload, sub: '1' })).toString('base64url');
    const res = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${h}.${forged}.${s}`);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('refuses a token signed with another secret', async () => {
    const user = await User.findOne({ where: { email: demo.operator } });
    const token = jwt.sign({ ver: user!.tokenVersion }, 'some-other-secret-some-other-secret-0000', { subject: String(user!.id), issuer: 'titrata', expiresIn: '1h' });
    expect((await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${token}`)).status).toBe(401);
  });

  it('refuses an expired token', async () => {
    const user = await User.findOne({ where: { email: demo.operator } });
    const token = jwt.sign({ ver: user!.tokenVersion, exp: Math.floor(Date.now() / 1000) - 60 }, config.jwtSecret, { subject: String(user!.id), issuer: 'titrata' });
    const res = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${token}`);
    expect(res.status).toBe(401);
  });

  it('rotates the secret: tokens of the previous secret work until they expire, new ones use the new secret', async () => {
    const old = await as(app, demo.operator);
    const rotated = apiTestApp({ JWT_SECRET: 'rotated-secret-rotated-secret-rotated-0001', JWT_PREVIOUS_SECRETS: config.jwtSecret }, sequelize);
    expect((await request(rotated.app).get('/api/v1/auth/me').set('Authorization', `Bearer ${old.token}`)).status).toBe(200);
    const fresh = (await request(rotated.app).post('/api/v1/auth/login').send({ email: demo.operator, password: DEMO_PASSWORD })).body.token;
    // signed with the new secret: the old configuration does not know it
    expect(jwt.verify(fresh, 'rotated-secret-rotated-secret-rotated-0001')).toBeTruthy();
    expect((await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${fresh}`)).status).toBe(401);
    // an expired token of the previous secret stays refused
    const user = await User.findOne({ where: { email: demo.operator } });
    const expired = jwt.sign({ ver: user!.tokenVersion, exp: Math.floor(Date.now() / 1000) - 60 }, config.jwtSecret, { subject: String(user!.id), issuer: 'titrata' });
    expect((await request(rotated.app).get('/api/v1/auth/me').set('Authorization', `Bearer ${expired}`)).status).toBe(401);
    // once the previous secret is dropped, its tokens end
    const done = apiTestApp({ JWT_SECRET: 'rotated-secret-rotated-secret-rotated-0001' }, sequelize);
    expect((await request(done.app).get('/api/v1/auth/me').set('Authorization', `Bearer ${old.token}`)).status).toBe(401);
  });

  it('refuses a request without a token', async () => {
    expect((await request(app).get('/api/v1/auth/me')).status).toBe(401);
  });
});

describe('POST /api/v1/auth/password', () => {
  it('enforces the minimum length and the common-password check, then changes it', async () => {
    const admin = await as(app, demo.admin);
    const me = await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${admin.token}`);
    const created = await admin.post('/api/v1/users', { email: 'changer@marrowfield.example', name: 'Pat Changer', role: 'analyst', organizationId: me.body.organization.id });
    const temp = created.body.temporaryPassword;
    const login = await request(app).post('/api/v1/auth/login').send({ email: 'changer@marrowfield.example', password: temp });
    expect(login.body.user.mustChangePassword).toBe(true);
    const auth = { Authorization: `Bearer ${login.body.token}` };

    const short = await request(app).post('/api/v1/auth/password').set(auth).send({ currentPassword: temp, newPassword: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.fields).toHaveProperty('newPassword');
    // "password1234" is in every common-password list (zxcvbn's dictionary)
    const common = await request(app).post('/api/v1/auth/password').set(auth).send({ currentPassword: temp, newPassword: 'password1234' });
    expect(common.status).toBe(400);
    expect(common.body.error.fields.newPassword).toMatch(/common/);
    const wrongCurrent = await request(app).post('/api/v1/auth/password').set(auth).send({ currentPassword: 'nope', newPassword: 'brine-lantern-quartz-88' });
    expect(wrongCurrent.status).toBe(400);
    expect(wrongCurrent.body.error.fields).toHaveProperty('currentPassword');

    const ok = await request(app).post('/api/v1/auth/password').set(auth).send({ currentPassword: temp, newPassword: 'brine-lantern-quartz-88' });
    expect(ok.status).toBe(200);
    expect(ok.body.user.mustChangePassword).toBe(false);
    // the old session ends; the new token works
    expect((await request(app).get('/api/v1/auth/me').set(auth)).status).toBe(401);
    expect((await request(app).get('/api/v1/auth/me').set('Authorization', `Bearer ${ok.body.token}`)).status).toBe(200);
  });
});
