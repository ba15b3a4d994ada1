import { spawn } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { pipeline } from 'node:stream/promises';
import zlib from 'node:zlib';
import mysql from 'mysql2/promise';

// Consistent backups: mariadb-dump --single-transaction (one InnoDB snapshot, no locks held against the app)
// plus the attachment store, with a manifest of table checksums and file hashes that a restore is checked
// against.

export type Manifest = {
  createdAt: string;
  database: string;
  tables: Record<string, { rows: number; checksum: string }>;
  files: Record<string, string>;
};

function parse(url: string) {
  const u = new URL(url);
  return {
    host: u.hostname,
    port: Number(u.port || 3306),
    user: decodeURIComponent(u.username),
    password: decodeURIComponent(u.password),
    database: u.pathname.replace(/^\//, ''),
  };
}

export async function tableChecksums(url: string): Promise<Manifest['tables']> {
  const c = parse(url);
  const conn = await mysql.createConnection({ ...c });
  try {
    const [tables] = await conn.query<mysql.RowDataPacket[]>(
      "SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ? AND table_type = 'BASE TABLE' ORDER BY table_name",
      [c.database],
    );
    const out: Manifest['tables'] = {};
    for (const { t } of tables) {
      // Sessions come and go while people work; they are not part of the record.
      if (t === 'sessions') continue;
      const [[sum]] = await conn.query<mysql.RowDataPacket[]>(`CHECKSUM TABLE \`${t}\` EXTENDED`);
      const [[cnt]] = await conn.query<mysql.RowDataPacket[]>(`SELECT COUNT(*) AS n FROM \`${t}\``);
      out[t] = { rows: Number(cnt.n), checksum: String(sum.Checksum) };
    }
    return out;
  } finally {
    await conn.end();
  }
}

function walk(dir: string, base = dir): string[] {
  if (!fs.existsSync(dir)) return [];
  return fs.readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = path.join(dir, e.name);
    return e.isDirectory() ? walk(p, base) : e.isFile() ? [path.relative(base, p)] : [];
  });
}

export function hashFiles(dir: string): Manifest['files'] {
  const out: Manifest['files'] = {};
  for (const rel of walk(dir).sort()) {
    out[rel] = crypto
      .createHash('sha256')
      .update(fs.readFileSync(path.join(dir, rel)))
      .digest('hex');
  }
  return out;
}

function run(
  cmd: string,
  args: string[],
  io: { stdin?: NodeJS.ReadableStream; stdout?: NodeJS.WritableStream; env?: NodeJS.ProcessEnv },
) {
  return new Promise<void>((resolve, reject) => {
    const child = spawn(cmd, args, { stdio: ['pipe', 'pipe', 'pipe'], env: { ...process.env, ...io.env } });
    let err = '';
    child.stderr.on('data', (d) => (err += d));
    if (io.stdout) child.stdout.pipe(io.stdout);
    else child.stdout.resume();
    if (io.stdin) io.stdin.pipe(child.stdin);
    else child.stdin.end();
    child.on('error', reject);
    child.on('close', (code) =>
      code === 0 ? resolve() : reject(new Error(`${cmd} exited ${code}: ${err.trim()}`)),
    );
  });
}

export async function backup(opts: { url: string; storageDir: string; outDir: string; now?: Date }) {
  const c = parse(opts.url);
  fs.mkdirSync(opts.outDir, { recursive: true });
  const tables = await tableChecksums(opts.url);
  const dumpFile = path.join(opts.outDir, 'database.sql.gz');
  const gzip = zlib.createGzip();
  const out = fs.createWriteStream(dumpFile);
  const piping = pipeline(gzip, out);
  await run(
    'mariadb-dump',
    [
      '--single-transaction',
      '--quick',
      '--routines',
      '--triggers',
      '--hex-blob',
      '--no-tablespaces',
      '--default-character-set=utf8mb4',
      `--host=${c.host}`,
      `--port=${c.port}`,
      `--user=${c.user}`,
      c.database,
    ],
    { stdout: gzip, env: { MYSQL_PWD: c.password } },
  );
  gzip.end();
  await piping;
  const filesDir = path.join(opts.outDir, 'attachments');
  if (fs.existsSync(opts.storageDir)) fs.cpSync(opts.storageDir, filesDir, { recursive: true });
  const manifest: Manifest = {
    createdAt: (opts.now ?? new Date()).toISOString(),
    database: c.database,
    tables,
    files: hashFiles(filesDir),
  };
  fs.writeFileSync(path.join(opts.outDir, 'manifest.json'), JSON.stringify(manifest, null, 2));
  return manifest;
}

export type RestoreReport = { ok: boolean; tables: number; files: number; mismatches: string[] };

/** Loads a backup into an empty database and storage folder, then checks both against the manifest. */
export async function restore(opts: {
  backupDir: string;
  url: string;
  storageDir: string;
}): Promise<RestoreReport> {
  const c = parse(opts.url);
  const manifest: Manifest = JSON.parse(fs.readFileSync(path.join(opts.backupDir, 'manifest.json'), 'utf8'));
  await run(
    'mariadb',
    [
      `--host=${c.host}`,
      `--port=${c.port}`,
      `--user=${c.user}`,
      '--default-character-set=utf8mb4',
      c.database,
    ],
    {
      stdin: fs.createReadStream(path.join(opts.backupDir, 'database.sql.gz')).pipe(zlib.createGunzip()),
      env: { MYSQL_PWD: c.password },
    },
  );
  const filesDir = path.join(opts.backupDir, 'attachments');
  if (fs.existsSync(filesDir)) fs.cpSync(filesDir, opts.storageDir, { recursive: true });
  return verify(manifest, opts.url, opts.storageDir);
}

export async function verify(manifest: Manifest, url: string, storageDir: string): Promise<RestoreReport> {
  const mismatches: string[] = [];
  const tables = await tableChecksums(url);
  for (const [t, want] of Object.entries(manifest.tables)) {
    const got = tables[t];
    if (!got) mismatches.push(`table ${t} is missing`);
    else if (got.rows !== want.rows || got.checksum !== want.checksum) {
      mismatches.push(
        `table ${t}: ${got.rows} rows / checksum ${got.checksum}, expected ${want.rows} / ${want.checksum}`,
      );
    }
  }
  const files = hashFiles(storageDir);
  for (const [f, sha] of Object.entries(manifest.files)) {
    if (files[f] !== sha) mismatches.push(`file ${f} ${files[f] ? 'differs' : 'is missing'}`);
  }
  return {
    ok: mismatches.length === 0,
    tables: Object.keys(manifest.tables).length,
    files: Object.keys(manifest.files).length,
    mismatches,
  };
}
