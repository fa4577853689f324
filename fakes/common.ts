// Small helpers shared by the local fakes: listening on a port (0 = any free port),
// closing an HTTP server without waiting for idle keep-alive sockets, and HTML escaping.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { RequestListener } from 'node:http';

export interface Listening {
  server: http.Server;
  port: number;
  close(): Promise<void>;
}

/** Starts an HTTP server and resolves once it listens; port 0 picks a free port. */
export function listenHttp(handler: RequestListener, port: number, host: string): Promise<Listening> {
  return new Promise((resolve, reject) => {
    const server = http.createServer(handler);
    server.once('error', reject);
    server.listen(port, host, () => {
      server.off('error', reject);
      const address = server.address() as AddressInfo;
      resolve({ server, port: address.port, close: () => closeHttp(server) });
    });
  });
}

/**
 * Closes a server and its sockets. Clients such as the payment SDK and undici keep
 * connections alive, and server.close() alone would wait for them to time out.
 */
export function closeHttp(server: http.Server): Promise<void> {
  return new Promise((resolve) => {
    if (!server.listening) return resolve();
    server.close(() => resolve());
    server.closeAllConnections();
  });
}

const HTML_ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
};

/** Escapes text for HTML element content and quoted attribute values (OWASP's five characters). */
export function escapeHtml(value: unknown): string {
  return String(value ?? '').replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/** Reads an integer environment variable, falling back when unset or not a number. */
export function envInt(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw.trim() === '') return fallback;
  const n = Number(raw);
  return Number.isInteger(n) && n >= 0 ? n : fallback;
}
