import net from 'node:net';
import { describe, expect, it } from 'vitest';
import { startServer } from '../../server/index.js';
import { testConfig } from '../setup/env.js';

describe('startServer', () => {
  it('refuses to start when its port is taken, instead of leaving another program answering', async () => {
    const squatter = net.createServer();
    await new Promise<void>((r) => squatter.listen(0, '127.0.0.1', () => r()));
    const port = (squatter.address() as net.AddressInfo).port;
    try {
      await expect(startServer(testConfig(process.env.TEST_API_DB ?? 'titrata_api', { PORT: String(port), HOST: '127.0.0.1' }))).rejects.toThrow(/cannot listen on 127\.0\.0\.1:\d+: .*EADDRINUSE/);
    } finally {
      await new Promise((r) => squatter.close(r));
    }
  });
});
