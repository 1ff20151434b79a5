/**
 * A one-node Slurm cluster on this machine for the tests, as root and without systemd (Debian's
 * slurm-wlm and munge, which .ci/run installs): the munge key is made if missing (mungekey), munged
 * runs as the munge user, and slurmctld and slurmd run from a slurm.conf written under a temporary
 * folder (SlurmUser=root, ProctrackType=proctrack/linuxproc, TaskPlugin=task/none, one node with
 * this machine's host name and CPUs, state, spool, logs and PID files in that folder, ports of
 * their own). `stop()` stops, by PID, exactly the daemons it started.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { availableParallelism, freemem, hostname, totalmem } from 'node:os';
import { join } from 'node:path';

export interface SlurmCluster {
  /** Environment for sbatch, squeue, sinfo: SLURM_CONF set. */
  env: NodeJS.ProcessEnv;
  dir: string;
  /** Waits until no job of `ids` is queued or running; throws on timeout with the queue and the logs. */
  waitFor(ids: string[], timeoutMs: number): Promise<void>;
  /** The state Slurm keeps of a finished job: `COMPLETED`, `FAILED`, … (from `scontrol show job`). */
  jobStates(id: string): string[];
  stop(): void;
}

const run = (cmd: string, args: string[], env?: NodeJS.ProcessEnv) => spawnSync(cmd, args, { encoding: 'utf8', env: env ?? process.env });

function pidOf(path: string): number | undefined {
  if (!existsSync(path)) return undefined;
  const pid = Number(readFileSync(path, 'utf8').trim());
  return Number.isInteger(pid) && pid > 0 ? pid : undefined;
}

function alive(pid: number | undefined): boolean {
  if (pid === undefined) return false;
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Starts the cluster in `dir`; throws with what went wrong when a daemon does not come up. */
export async function startSlurmCluster(dir: string): Promise<SlurmCluster> {
  for (const tool of ['munged', 'slurmctld', 'slurmd', 'sbatch']) {
    if (run('sh', ['-c', `command -v ${tool} || test -x /usr/sbin/${tool}`]).status !== 0) {
      throw new Error(`${tool} is not installed: the Slurm test needs Debian's slurm-wlm and munge (.ci/run installs them)`);
    }
  }
  // munge: a key, its run folder, the daemon as the munge user (reused when already running).
  let mungePid: number | undefined;
  if (!existsSync('/etc/munge/munge.key')) execFileSync('/usr/sbin/mungekey', ['-c']);
  execFileSync('chown', ['munge:munge', '/etc/munge/munge.key']);
  mkdirSync('/run/munge', { recursive: true });
  execFileSync('chown', ['munge:munge', '/run/munge']);
  if (run('pgrep', ['-x', 'munged']).status !== 0) {
    execFileSync('runuser', ['-u', 'munge', '--', '/usr/sbin/munged']);
    mungePid = Number(run('pgrep', ['-n', '-x', 'munged']).stdout.trim()) || undefined;
  }
  for (const d of ['state', 'spool', 'log']) mkdirSync(join(dir, d), { recursive: true });
  const host = hostname().split('.')[0];
  const memMb = Math.max(2048, Math.floor(Math.min(totalmem() - 2 * 1024 ** 3, freemem() + 8 * 1024 ** 3) / 1024 ** 2));
  const conf = join(dir, 'slurm.conf');
  writeFileSync(
    conf,
    [
      'ClusterName=heathours-test',
      `SlurmctldHost=${host}`,
      'SlurmUser=root',
      'SlurmdUser=root',
      'AuthType=auth/munge',
      'ProctrackType=proctrack/linuxproc',
      'TaskPlugin=task/none',
      'SelectType=select/cons_tres',
      'SelectTypeParameters=CR_Core_Memory',
      'ReturnToService=2',
      'MpiDefault=none',
      'SchedulerType=sched/backfill',
      'JobCompType=jobcomp/none',
      'AccountingStorageType=accounting_storage/none',
      'MinJobAge=3600',
      `StateSaveLocation=${join(dir, 'state')}`,
      `SlurmdSpoolDir=${join(dir, 'spool')}`,
      `SlurmctldPidFile=${join(dir, 'slurmctld.pid')}`,
      `SlurmdPidFile=${join(dir, 'slurmd.pid')}`,
      `SlurmctldLogFile=${join(dir, 'log', 'slurmctld.log')}`,
      `SlurmdLogFile=${join(dir, 'log', 'slurmd.log')}`,
      // Ports of its own, so a cluster left by another run or a real one on the default ports does not answer.
      'SlurmctldPort=16917',
      'SlurmdPort=16918',
      `NodeName=${host} CPUs=${availableParallelism()} RealMemory=${memMb} State=UNKNOWN`,
      `PartitionName=main Nodes=${host} Default=YES MaxTime=INFINITE State=UP`,
      '',
    ].join('\n'),
  );
  const env = { ...process.env, SLURM_CONF: conf };
  const ctld = run('/usr/sbin/slurmctld', ['-f', conf], env);
  if (ctld.status !== 0) throw new Error(`slurmctld did not start: ${ctld.stderr}`);
  const d = run('/usr/sbin/slurmd', ['-f', conf], env);
  if (d.status !== 0) throw new Error(`slurmd did not start: ${d.stderr}`);
  const stop = () => {
    for (const f of ['slurmd.pid', 'slurmctld.pid']) {
      const pid = pidOf(join(dir, f));
      if (alive(pid)) process.kill(pid!, 'SIGTERM');
    }
    if (mungePid !== undefined && alive(mungePid)) process.kill(mungePid, 'SIGTERM');
  };
  const logs = () =>
    ['slurmctld.log', 'slurmd.log']
      .map(
        (f) =>
          `--- ${f}\n${
            existsSync(join(dir, 'log', f))
              ? readFileSync(join(dir, 'log', f), 'utf8')
                  .split('\n')
                  .slice(-30)
                  .join('\n')
              : '(none)'
          }`,
      )
      .join('\n');
  // The node is ready when sinfo shows it idle.
  const deadline = Date.now() + 60_000;
  for (;;) {
    const s = run('sinfo', ['-h', '-o', '%t'], env);
    if (s.status === 0 && /idle/.test(s.stdout)) break;
    if (Date.now() > deadline) {
      stop();
      throw new Error(`the one-node Slurm cluster did not become idle: sinfo said "${s.stdout.trim()}${s.stderr.trim()}"\n${logs()}`);
    }
    await new Promise((r) => setTimeout(r, 500));
  }
  return {
    env,
    dir,
    async waitFor(ids, timeoutMs) {
      const end = Date.now() + timeoutMs;
      for (;;) {
        const q = run('squeue', ['-h', '-j', ids.join(','), '-o', '%i %T %r'], env);
        if (q.status === 0 && q.stdout.trim() === '') return;
        if (Date.now() > end) throw new Error(`Slurm jobs ${ids.join(', ')} still queued after ${timeoutMs / 1000} s:\n${q.stdout}${q.stderr}\n${logs()}`);
        await new Promise((r) => setTimeout(r, 1000));
      }
    },
    jobStates(id) {
      const s = run('scontrol', ['show', 'job', id, '-o'], env);
      return [...s.stdout.matchAll(/JobState=(\S+)/g)].map((m) => m[1]);
    },
    stop,
  };
}
