import Stripe from 'stripe';
import type { Config } from '../config.js';

/**
 * The official payment SDK from configuration: host, port and protocol point it at the local
 * stand-in (fakes/payments) in development and tests; in production the provider's own host
 * and a live secret key come from the same variables, with no change of code.
 */
export function createPaymentsClient(config: Config): Stripe {
  return new Stripe(config.PAYMENTS_SECRET_KEY, {
    host: config.PAYMENTS_HOST,
    port: config.PAYMENTS_PORT,
    protocol: config.PAYMENTS_PROTOCOL,
    maxNetworkRetries: 2,
    timeout: 15_000,
    telemetry: false,
  });
}
