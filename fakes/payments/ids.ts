// Object ids in the provider's style: a type prefix and a random base62 tail
// (the provider's API reference shows ids such as cus_…, pi_…, evt_…; lengths from memory).
import { randomInt } from 'node:crypto';

const ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz';

export function randomToken(length: number): string {
  let out = '';
  for (let i = 0; i < length; i++) out += ALPHABET[randomInt(ALPHABET.length)];
  return out;
}

const TAIL: Record<string, number> = {
  cus_: 14,
  cs_test_: 58,
  req_: 14,
  li_: 24,
  prod_: 14,
};

export function newId(prefix: string): string {
  return prefix + randomToken(TAIL[prefix] ?? 24);
}
