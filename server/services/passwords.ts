import bcrypt from 'bcryptjs';
import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as common from '@zxcvbn-ts/language-common';
import { randomBytes } from 'node:crypto';
import { PASSWORD_MIN_LENGTH } from '../../shared/schemas/auth.js';
import { ValidationError } from '../errors.js';

const BCRYPT_ROUNDS = 10;
let zxcvbn: ZxcvbnFactory | null = null;

export const hashPassword = (plain: string) => bcrypt.hash(plain, BCRYPT_ROUNDS);
export const verifyPassword = (plain: string, hash: string) => bcrypt.compare(plain, hash);

/** A hash to compare against when the e-mail is unknown, so both paths take the same time. */
export const DUMMY_HASH = bcrypt.hashSync('not-a-real-password-for-timing', BCRYPT_ROUNDS);

/**
 * Password policy: minimum length, and not a common or easily guessed password
 * (zxcvbn's common-password dictionary; score 0–1 is refused).
 */
export function assertAcceptablePassword(password: string, userInputs: string[] = [], field = 'newPassword'): void {
  if (password.length < PASSWORD_MIN_LENGTH) throw new ValidationError('The password is too short.', { [field]: `at least ${PASSWORD_MIN_LENGTH} characters` });
  zxcvbn ??= new ZxcvbnFactory({ dictionary: { ...common.dictionary }, graphs: common.adjacencyGraphs });
  const result = zxcvbn.check(password, userInputs);
  if (result.score < 2) {
    throw new ValidationError('The password is too common or too easy to guess.', { [field]: 'too common or easy to guess; use a longer phrase' });
  }
}

/** A temporary password shown once to the administrator (and later e-mailed). */
export function temporaryPassword(): string {
  return randomBytes(12).toString('base64url');
}
