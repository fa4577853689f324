/**
 * A private MariaDB instance under .data/: initialised on first use, started bound to
 * 127.0.0.1 with its own socket and pid file (never through systemd), stopped cleanly.
 * Used by `npm start` (DB_PORT, .data/db) and by the tests (TEST_DB_PORT, .data/test-db).
 */
import { execFile, spawn } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { promisify } from 'node:util';
import mariadb from 'mariadb';

const run = promisify(execFile);

export interface InstanceOptions {
  /** Folder holding the data directory, socket, pid file and error log. */
  dir: string;
  port: number;
}

export interface Instance extends InstanceOptions {
  socket: string;
  /** True when this process started mariadbd (so it should stop it). */
  startedHere: boolean;
}

function binary(name: string): string {
  for (const dir of ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin']) {
    const p = path.join(dir, name);
    if (existsSync(p)) return p;
  }
  return name;
}

const asRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function paths(o: InstanceOptions) {
  return {
    datadir: path.join(o.dir, 'db'),
    socket: path.join(o.dir, 'mariadb.sock'),
    pid: path.join(o.dir, 'mariadb.pid'),
    log: path.join(o.dir, 'mariadb.err'),
  };
}

async function ping(socket: string): Promise<boolean> {
  try {
    await run(binary('mariadb-admin'), ['--no-defaults', `--socket=${socket}`, '-uroot', '--connect-timeout=1', 'ping'], {
      timeout: 5000,
    });
    return true;
  } catch {
    return false;
  }
}

/** Initialises (first run) and starts the instance if it is not already answering. */
export async function startInstance(o: InstanceOptions): Promise<Instance> {
  const p = paths(o);
  mkdirSync(o.dir, { recursive: true });
  if (await ping(p.socket)) return { ...o, socket: p.socket, startedHere: false };

  if (!existsSync(path.join(p.datadir, 'mysql'))) {
    mkdirSync(p.datadir, { recursive: true });
    await run(
      binary('mariadb-install-db'),
      [
        '--no-defaults',
        ...(asRoot ? ['--user=root'] : []),
        `--datadir=${p.datadir}`,
        '--auth-root-authentication-method=normal',
        '--skip-test-db',
      ],
      { timeout: 120_000 },
    );
  }

  const child = spawn(
    binary('mariadbd'),
    [
      '--no-defaults',
      ...(asRoot ? ['--user=root'] : []),
      `--datadir=${p.datadir}`,
      '--bind-address=127.0.0.1',
      `--port=${o.port}`,
      `--socket=${p.socket}`,
      `--pid-file=${p.pid}`,
      `--log-error=${p.log}`,
      '--skip-name-resolve',
      '--character-set-server=utf8mb4',
      '--collation-server=utf8mb4_unicode_ci',
      '--innodb-buffer-pool-size=256M',
      '--max-connections=500',
    ],
    { detached: true, stdio: 'ignore' },
  );
  child.unref();

  const deadline = Date.now() + 60_000;
  while (!(await ping(p.socket))) {
    if (child.exitCode !== null || Date.now() > deadline) {
      const tail = existsSync(p.log) ? readFileSync(p.log, 'utf8').split('\n').slice(-15).join('\n') : '';
      throw new Error(`MariaDB did not start on 127.0.0.1:${o.port}. Last lines of ${p.log}:\n${tail}`);
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  return { ...o, socket: p.socket, startedHere: true };
}

/** Clean shutdown through mariadb-admin; waits until the pid file is gone. */
export async function stopInstance(o: InstanceOptions): Promise<void> {
  const p = paths(o);
  if (!(await ping(p.socket))) return;
  await run(binary('mariadb-admin'), ['--no-defaults', `--socket=${p.socket}`, '-uroot', 'shutdown'], {
    timeout: 60_000,
  }).catch(() => undefined);
  const deadline = Date.now() + 30_000;
  while (existsSync(p.pid) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
}

/** Creates the database and the application user (idempotent), connecting as root over the socket. */
export async function ensureDatabase(inst: Instance, db: { name: string; user: string; password: string; fresh?: boolean }) {
  const conn = await mariadb.createConnection({ socketPath: inst.socket, user: 'root' });
  try {
    if (db.fresh) await conn.query(`DROP DATABASE IF EXISTS \`${db.name}\``);
    await conn.query(`CREATE DATABASE IF NOT EXISTS \`${db.name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    for (const host of ['127.0.0.1', 'localhost']) {
      await conn.query(`CREATE USER IF NOT EXISTS ?@? IDENTIFIED BY ?`, [db.user, host, db.password]);
      await conn.query(`ALTER USER ?@? IDENTIFIED BY ?`, [db.user, host, db.password]);
      await conn.query(`GRANT ALL PRIVILEGES ON \`${db.name}\`.* TO ?@?`, [db.user, host]);
    }
  } finally {
    await conn.end();
  }
}
