// End to end on a real batch scheduler (issue 14): a single-node Slurm (Debian packages slurm-wlm and
// munge) is configured and started here in a temporary folder (own munged socket and key, own ports,
// own state: nothing in /etc is touched), the sharded study runs through
// `sbatch --wait --array=1-3 examples/slurm/study-array.sh`, the shards are merged by
// `examples/slurm/study-merge.sh` (also through sbatch), and the merged results must be byte-identical
// to a local run of the whole study. The daemons started here are stopped by their process ids.
//
// Slurm missing: installed with apt-get when running as root (.ci/run does this first); otherwise the
// test FAILS (it never skips), naming the packages.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { hostname, tmpdir } from 'node:os';
import { join } from 'node:path';
import { randomBytes } from 'node:crypto';

const ROOT = process.cwd();
const BIN = join(ROOT, 'bin', 'bandbend.js');
const DAEMONS = ['/usr/sbin/munged', '/usr/sbin/slurmctld', '/usr/sbin/slurmd', '/usr/bin/sbatch', '/usr/bin/sinfo'];

let work: string;
const children: ChildProcess[] = [];
let env: NodeJS.ProcessEnv;

function ensureSlurm(): void {
  if (DAEMONS.every((p) => existsSync(p))) return;
  if (process.getuid?.() !== 0) {
    throw new Error(`Slurm is not installed (${DAEMONS.filter((p) => !existsSync(p)).join(', ')} missing) and this is not root: install the Debian packages slurm-wlm and munge (.ci/run does it as root)`);
  }
  const r = spawnSync('bash', ['-c', 'apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq slurm-wlm munge'], { encoding: 'utf8' });
  if (r.status !== 0 || !DAEMONS.every((p) => existsSync(p))) throw new Error(`apt-get install slurm-wlm munge failed: ${r.stderr.slice(-500)}`);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

function daemon(cmd: string, args: string[], log: string): ChildProcess {
  const out = join(work, 'log', log);
  const child = spawn(cmd, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
  let text = '';
  const keep = (c: Buffer): void => {
    text += c.toString();
    writeFileSync(out, text);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  children.push(child);
  return child;
}

async function waitFor(what: string, check: () => boolean, seconds: number): Promise<void> {
  for (let i = 0; i < seconds * 10; i++) {
    if (check()) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  const logs = existsSync(join(work, 'log'))
    ? readdirSync(join(work, 'log'))
        .map((f) => `--- ${f}\n${readFileSync(join(work, 'log', f), 'utf8').slice(-1500)}`)
        .join('\n')
    : '';
  throw new Error(`timed out waiting for ${what}\n${logs}`);
}

beforeAll(async () => {
  ensureSlurm();
  work = mkdtempSync(join(tmpdir(), 'bandbend-slurm-'));
  chmodSync(work, 0o755); // munged wants its socket folder reachable
  for (const d of ['munge', 'state', 'spool', 'log', 'out']) mkdirSync(join(work, d));
  chmodSync(join(work, 'munge'), 0o755);
  writeFileSync(join(work, 'munge', 'munge.key'), randomBytes(1024), { mode: 0o400 });
  const socket = join(work, 'munge', 'munge.socket');
  const [ctldPort, dPort] = [await freePort(), await freePort()];
  const node = hostname().split('.')[0]!;
  const conf = join(work, 'slurm.conf');
  // settings for a container without cgroup delegation, as in /work/shared/notes (linuxproc, task/none)
  writeFileSync(
    conf,
    [
      'ClusterName=bandbendtest',
      `SlurmctldHost=${node}`,
      `SlurmctldPort=${ctldPort}`,
      `SlurmdPort=${dPort}`,
      'AuthType=auth/munge',
      'CredType=cred/munge',
      `AuthInfo=socket=${socket}`,
      'SlurmUser=root',
      'SlurmdUser=root',
      `StateSaveLocation=${join(work, 'state')}`,
      `SlurmdSpoolDir=${join(work, 'spool')}`,
      `SlurmctldPidFile=${join(work, 'slurmctld.pid')}`,
      `SlurmdPidFile=${join(work, 'slurmd.pid')}`,
      `SlurmctldLogFile=${join(work, 'log', 'slurmctld.log')}`,
      `SlurmdLogFile=${join(work, 'log', 'slurmd.log')}`,
      'ProctrackType=proctrack/linuxproc',
      'TaskPlugin=task/none',
      'JobAcctGatherType=jobacct_gather/none',
      'AccountingStorageType=accounting_storage/none',
      'SelectType=select/cons_tres',
      'SelectTypeParameters=CR_Core',
      'MpiDefault=none',
      'ReturnToService=2',
      `NodeName=${node} CPUs=2 State=UNKNOWN`,
      'PartitionName=bandbend Nodes=ALL Default=YES MaxTime=INFINITE State=UP',
      '',
    ].join('\n'),
  );
  env = { ...process.env, SLURM_CONF: conf };
  daemon(
    '/usr/sbin/munged',
    ['-F', '-f', `--socket=${socket}`, `--key-file=${join(work, 'munge', 'munge.key')}`, `--log-file=${join(work, 'log', 'munged.log')}`, `--pid-file=${join(work, 'munge', 'munged.pid')}`, `--seed-file=${join(work, 'munge', 'seed')}`],
    'munged.out',
  );
  await waitFor('munged', () => existsSync(socket), 20);
  daemon('/usr/sbin/slurmctld', ['-D'], 'slurmctld.out');
  await waitFor('slurmctld', () => spawnSync('/usr/bin/sinfo', ['-h'], { env }).status === 0, 30);
  daemon('/usr/sbin/slurmd', ['-D'], 'slurmd.out');
  await waitFor('the node to be idle', () => /idle/.test(spawnSync('/usr/bin/sinfo', ['-h', '-o', '%T'], { env, encoding: 'utf8' }).stdout), 60);
}, 300_000);

afterAll(async () => {
  // stop the daemons started above, by their process ids, slurmd first
  for (const child of [...children].reverse()) {
    if (child.exitCode !== null || child.signalCode !== null) continue;
    const exited = new Promise((r) => child.once('exit', r));
    child.kill('SIGTERM');
    await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
    if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
  }
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('Slurm job array', () => {
  it('runs a sharded study with sbatch --wait --array=1-3, merges it through sbatch, equal to a local run', () => {
    const study = join(work, 'study.yaml');
    writeFileSync(
      study,
      [
        'name: slurm-shards',
        'base: { workFunction: 5.3, electronAffinity: 4.2, bandGap: 3.2, permittivity: 10, electronMass: 0.3, holeMass: 1, donorLevel: 0.1 }',
        'sweep:',
        '  axes:',
        '    - { field: donors, log: { from: 1e16, to: 1e19, points: 13 }, unit: cm^-3 }',
        '    - { field: temperature, values: [300, 400, 5000, 600], unit: K }',
        'outputs: [bandBending_eV, direction, warnings]',
        '',
      ].join('\n'),
    );
    const out = join(work, 'out', 'study');
    const jobEnv = { ...env, STUDY: study, OUT: out, BANDBEND: `${process.execPath} ${BIN}` };
    const array = spawnSync(
      '/usr/bin/sbatch',
      ['--wait', '--array=1-3', '--cpus-per-task=1', `--output=${join(work, 'log', 'array-%A_%a.out')}`, join(ROOT, 'examples', 'slurm', 'study-array.sh')],
      { env: jobEnv, encoding: 'utf8', timeout: 240_000 },
    );
    const taskLogs = readdirSync(join(work, 'log'))
      .filter((f) => f.startsWith('array-'))
      .map((f) => readFileSync(join(work, 'log', f), 'utf8'));
    expect(array.status, `${array.stderr}\n${taskLogs.join('\n')}`).toBe(0);
    expect(array.stdout).toMatch(/Submitted batch job \d+/);
    expect(readdirSync(out).sort()).toEqual(['shard-1-of-3', 'shard-2-of-3', 'shard-3-of-3']);
    // 52 points over 3 shards: 18, 17, 17
    expect(taskLogs.join('\n')).toMatch(/18 of 18 points written \(4 failed\)/);

    const merge = spawnSync('/usr/bin/sbatch', ['--wait', `--output=${join(work, 'log', 'merge-%j.out')}`, join(ROOT, 'examples', 'slurm', 'study-merge.sh')], {
      env: jobEnv,
      encoding: 'utf8',
      timeout: 240_000,
    });
    const mergeLog = readdirSync(join(work, 'log'))
      .filter((f) => f.startsWith('merge-'))
      .map((f) => readFileSync(join(work, 'log', f), 'utf8'))
      .join('\n');
    expect(merge.status, `${merge.stderr}\n${mergeLog}`).toBe(0);
    expect(mergeLog).toMatch(/52 rows merged from 3 shards \(13 failed\)/);

    const local = join(work, 'out', 'local');
    expect(spawnSync(process.execPath, [BIN, 'study', study, '--out', local, '--jobs', '1', '--no-plots']).status).toBe(0);
    for (const f of ['results.csv', 'results.jsonl']) {
      expect(readFileSync(join(out, 'all', f), 'utf8')).toBe(readFileSync(join(local, f), 'utf8'));
    }
    expect(existsSync(join(out, 'all', 'report', 'index.html'))).toBe(true);
  });
});
