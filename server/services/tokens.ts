import { createSecretKey, type KeyObject } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { Config } from '../config.js';

interface Claims {
  sub: string;
  ver: number;
}

/** Signs a session token (HS256) that names the user and their token version. */
export function signToken(config: Config, userId: number, tokenVersion: number): { token: string; expiresAt: string } {
  const token = jwt.sign({ ver: tokenVersion }, config.jwtSecret, {
    subject: String(userId),
    expiresIn: config.JWT_TTL as jwt.SignOptions['expiresIn'],
    algorithm: 'HS256',
    issuer: 'titrata',
  });
  const { exp } = jwt.decode(token) as { exp: number };
  return { token, expiresAt: new Date(exp * 1000).toISOString() };
}

/**
 * Verifies signature, algorithm, issuer and expiry; returns null for any bad token. During a
 * secret rotation, tokens signed with a secret in JWT_PREVIOUS_SECRETS stay valid until they
 * expire; new tokens are always signed with JWT_SECRET.
 */
const keys = new Map<string, KeyObject>();
/**
 * The secret as a key object, made once: given a string, jsonwebtoken first tries it as a
 * public key and builds a secret key only after that fails, on every request.
 */
function secretKey(secret: string): KeyObject {
  let key = keys.get(secret);
  if (!key) keys.set(secret, (key = createSecretKey(Buffer.from(secret, 'utf8'))));
  return key;
}

export function verifyToken(config: Config, token: string): { userId: number; tokenVersion: number } | null {
  for (const secret of [config.jwtSecret, ...config.jwtPreviousSecrets]) {
    try {
      const c = jwt.verify(token, secretKey(secret), { algorithms: ['HS256'], issuer: 'titrata' }) as unknown as Claims;
      const userId = Number(c.sub);
      if (!Number.isInteger(userId)) return null;
      return { userId, tokenVersion: Number(c.ver ?? 0) };
    } catch (err) {
      // Only a wrong signature may be tried against the next secret; expired is expired.
      if (!(err instanceof jwt.JsonWebTokenError) || err instanceof jwt.TokenExpiredError || err.message !== 'invalid signature') return null;
    }
  }
  return null;
}
