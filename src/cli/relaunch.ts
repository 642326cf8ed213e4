// Running the command for a large table again, in a child Node process
// started with --no-concurrent-recompilation, on a machine of two cores or
// fewer.
//
// A large table is done in two threads (io/parts.ts), which keep both cores
// busy. The engine optimises hot code in background threads of its own,
// which then compete with the two working threads while the code waiting
// for them runs slower meanwhile. The worker's engine is told to compile in
// its own thread (io/worker-thread.ts), but the main thread's engine exists
// before any of famwise's code runs and keeps its default: at a million rows
// that cost about 0.1 s of a 1.1 s run (measured with the flag given to node
// by hand). The flag can only be given on Node's command line: NODE_OPTIONS
// refuses it, setting it from within changes only engines made afterwards,
// and a script's first line cannot pass it everywhere (BusyBox's env has no
// -S). So when the table is large enough to repay a second start, this
// process starts the command again in a child with the flag, passes on the
// signals it gets, and ends with the child's exit status; the child does
// everything else, and it alone uses standard input and output.
//
// The child's environment lacks NODE_EXTRA_CA_CERTS: famwise opens no
// connections, and Node reads every certificate of that file when it
// starts (55 ms for the 144 of the system bundle, on the benchmark machine).
// It asks glibc's malloc for transparent huge pages (GLIBC_TUNABLES, below).

import { type Stats, closeSync, openSync, readSync } from 'node:fs';
import { availableParallelism, constants } from 'node:os';
import { fileURLToPath } from 'node:url';
import { isGzip } from '../io/gzip.js';
import { childProcess } from '../io/lazy-builtin.js';
import { largestInput, sizeSetting, smallestInParts, workerFile } from '../io/worker-thread.js';

/**
 * The command that gains: inspect of a million rows, which reads in two
 * threads but computes in one, took as long either way (11 runs each).
 */
const RELAUNCHED_COMMAND = 'adjust';
/** Set in the child's environment: it runs the command itself. */
const CHILD = 'FAMWISE_RELAUNCHED';
/**
 * Below this many bytes of input the command runs in this process
 * (FAMWISE_RELAUNCH_MIN_BYTES sets another). At 20 MB (half a million rows
 * of the benchmark's table) the child's start cost what the flag saved; at
 * 42 MB the child was 70 ms faster (medians of 15 runs in turns with the
 * command run directly).
 */
const SMALLEST = 32 << 20;
const FLAG = '--no-concurrent-recompilation';
/** Signals passed on to the child; the child's own handlers then tidy up and end (cli/main.ts). */
const PASSED_ON = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;

export interface RelaunchContext {
  readonly env: NodeJS.ProcessEnv;
  /** Node's own options this process was started with. */
  readonly execArgv: readonly string[];
  readonly cores: number;
  readonly stdinStat: () => Stats | undefined;
}

/**
 * Whether to run the command in a child: adjust of a table large enough, to
 * be read in two parts, on two cores or fewer; not in the child itself, nor
 * when Node was started with options of its own (which a child would not
 * have) or with a debugger in NODE_OPTIONS (which a child would start again).
 */
export function relaunchWanted(args: readonly string[], context: RelaunchContext): boolean {
  const { env, execArgv, cores } = context;
  if (env[CHILD] === '1' || execArgv.length > 0 || /--inspect/.test(env.NODE_OPTIONS ?? '') || cores > 2 || workerFile() === undefined) return false;
  if (args.find((arg) => !arg.startsWith('-')) !== RELAUNCHED_COMMAND) return false;
  const { size, path } = largestInput(args, context.stdinStat);
  if (!(size > 0 && size >= sizeSetting(env, 'FAMWISE_RELAUNCH_MIN_BYTES', SMALLEST) && size >= smallestInParts(env))) return false;
  // gzip is read in one thread (io/gzip.ts), which gains nothing from the flag.
  return !startsGzip(path);
}

/** Whether the file (standard input when undefined, a regular file then) starts as gzip does; read by position, so nothing is consumed. */
function startsGzip(path: string | undefined): boolean {
  const head = Buffer.alloc(2);
  let fd = 0;
  try {
    if (path !== undefined) fd = openSync(path, 'r');
    return readSync(fd, head, 0, 2, 0) === 2 && isGzip(head);
  } catch {
    return false;
  } finally {
    if (path !== undefined && fd !== 0) closeSync(fd);
  }
}

/**
 * The glibc setting that has malloc ask the kernel for transparent huge
 * pages (madvise) for the memory it maps: the table's arrays, the output's
 * blocks. A page fault then maps 2 MB rather than 4 KB, and memory touched
 * for the first time costs far fewer of them: a million rows, 12 runs in
 * turns, 0.89 to 0.81 s, page faults 34 to 22 thousand (the benchmark
 * machine, a virtual machine where faults are dear). Where the kernel's
 * huge pages are off, where the C library is not glibc (2.35 or later), or
 * where the caller's GLIBC_TUNABLES already sets it, nothing changes.
 */
const HUGE_PAGES = 'glibc.malloc.hugetlb';

/** GLIBC_TUNABLES with huge pages asked for, unless the caller's own value says otherwise. */
export function withHugePages(tunables: string | undefined): string {
  if (tunables === undefined || tunables === '') return `${HUGE_PAGES}=1`;
  if (tunables.split(':').some((setting) => setting.startsWith(`${HUGE_PAGES}=`))) return tunables;
  return `${tunables}:${HUGE_PAGES}=1`;
}

/** The child's environment: this one's, marked as the child's, without the certificates file, with huge pages asked for. */
export function childEnvironment(env: NodeJS.ProcessEnv): NodeJS.ProcessEnv {
  const { NODE_EXTRA_CA_CERTS: _certificates, ...rest } = env;
  return { ...rest, [CHILD]: '1', GLIBC_TUNABLES: withHugePages(env.GLIBC_TUNABLES) };
}

/**
 * Runs the command in a child started with the flag, and sets this
 * process's exit status to the child's; resolves false, having done
 * nothing, if no child could be started (this process then runs the command).
 */
export function runInChild(entry: string, args: readonly string[], env: NodeJS.ProcessEnv): Promise<boolean> {
  return new Promise<boolean>((resolve) => {
    let child: ReturnType<ReturnType<typeof childProcess>['spawn']>;
    try {
      // With a channel, closed when this process ends, however it ends: a SIGKILL, which cannot be
      // passed on, stops the child too (watchParent).
      child = childProcess().spawn(process.execPath, [FLAG, entry, ...args], { stdio: ['inherit', 'inherit', 'inherit', 'ipc'], env: childEnvironment(env) });
    } catch {
      // Some failures are thrown at once (an environment too large, a permission model that forbids child processes).
      resolve(false);
      return;
    }
    let started = false;
    const passOn = (signal: NodeJS.Signals): void => {
      child.kill(signal);
    };
    const stopPassing = (): void => {
      for (const signal of PASSED_ON) process.off(signal, passOn);
    };
    // Until the child ends, a signal is the child's to act on (an interrupt at the terminal reaches both).
    for (const signal of PASSED_ON) process.on(signal, passOn);
    child.once('spawn', () => {
      started = true;
    });
    child.on('error', () => {
      // After the start (a signal that could not be passed on) the child's exit is still to come.
      if (started) return;
      stopPassing();
      resolve(false);
    });
    child.once('exit', (code, signal) => {
      if (!started) return;
      stopPassing();
      // As a shell reports a process ended by a signal.
      process.exitCode = code ?? 128 + (signal ? constants.signals[signal] : 0);
      resolve(true);
    });
  });
}

/**
 * In the child: when the process that started it ends before it (killed,
 * say), stops as on SIGTERM (cli/main.ts: unfinished files removed), rather
 * than finish a job nobody waits for and replace its output.
 */
export function watchParent(): void {
  if (process.env[CHILD] !== '1' || process.channel === undefined) return;
  // The channel does not keep the child alive.
  process.channel.unref();
  process.once('disconnect', () => process.kill(process.pid, 'SIGTERM'));
}

/** Runs the command in a child if that is worth it here (relaunchWanted); whether it did. */
export async function relaunched(args: readonly string[], entry: string | URL, stdinStat: () => Stats | undefined): Promise<boolean> {
  const context = { env: process.env, execArgv: process.execArgv, cores: availableParallelism(), stdinStat };
  if (!relaunchWanted(args, context)) return false;
  return runInChild(entry instanceof URL ? fileURLToPath(entry) : entry, args, process.env);
}
