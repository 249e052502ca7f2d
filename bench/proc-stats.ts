/**
 * What the benchmarks read from /proc (Linux only): process groups, the next-server process of a
 * group, its memory (VmRSS, VmHWM) and CPU time, and Next processes of others in this tree.
 */
import fs from "node:fs";

/** Clock ticks per second of utime/stime in /proc/<pid>/stat (USER_HZ, 100 on every Linux we run on). */
const CLOCK_TICKS = 100;

export interface ProcStat {
  pid: number;
  ppid: number;
  pgrp: number;
  comm: string;
  utime: number;
  stime: number;
}

const pids = () =>
  fs
    .readdirSync("/proc")
    .filter((d) => /^\d+$/.test(d))
    .map(Number);

function cmdline(pid: number): string {
  try {
    return fs.readFileSync(`/proc/${pid}/cmdline`, "utf8");
  } catch {
    return "";
  }
}

/** pid, parent, process group and CPU ticks from /proc/<pid>/stat (the command name may hold spaces and parentheses). */
export function readStat(pid: number): ProcStat | null {
  try {
    const s = fs.readFileSync(`/proc/${pid}/stat`, "utf8");
    const close = s.lastIndexOf(")");
    const rest = s.slice(close + 2).split(" ");
    // rest[0] is field 3 (state): ppid is field 4, pgrp 5, utime 14, stime 15.
    return { pid, comm: s.slice(s.indexOf("(") + 1, close), ppid: Number(rest[1]), pgrp: Number(rest[2]), utime: Number(rest[11]), stime: Number(rest[12]) };
  } catch {
    return null;
  }
}

export function processGroup(pgid: number): ProcStat[] {
  return pids()
    .map(readStat)
    .filter((p): p is ProcStat => p !== null && p.pgrp === pgid);
}

/** kB fields of /proc/<pid>/status (VmRSS, VmHWM); null once the process is gone. */
export function statusKb(pid: number, field: "VmRSS" | "VmHWM"): number | null {
  try {
    const m = new RegExp(`^${field}:\\s+(\\d+) kB`, "m").exec(fs.readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) : null;
  } catch {
    return null;
  }
}

/** User + system CPU time of a process in ms; null once it is gone. */
export function cpuMs(pid: number): number | null {
  const s = readStat(pid);
  return s ? ((s.utime + s.stime) * 1000) / CLOCK_TICKS : null;
}

export interface ServerProcess {
  pid: number;
  comm: string;
  group: Array<{ pid: number; comm: string }>;
}

/** The next-server process of the group started by spawnNext: by name, else the largest. */
export function findServerPid(pgid: number): ServerProcess {
  const group = processGroup(pgid);
  if (group.length === 0) throw new Error(`no process in group ${pgid}`);
  const named = group.filter((p) => p.comm.startsWith("next-server") || cmdline(p.pid).startsWith("next-server"));
  const pick = (named.length ? named : group).reduce((a, b) => ((statusKb(b.pid, "VmRSS") ?? 0) > (statusKb(a.pid, "VmRSS") ?? 0) ? b : a));
  return { pid: pick.pid, comm: pick.comm, group: group.map(({ pid, comm }) => ({ pid, comm })) };
}

/** Next processes of other people working in this tree (`npm test` builds without the flock). */
export function foreignNext(kind: "next-build" | "next-server"): number[] {
  const root = process.cwd();
  return pids().filter((pid) => {
    try {
      return cmdline(pid).startsWith(kind) && fs.readlinkSync(`/proc/${pid}/cwd`) === root;
    } catch {
      return false;
    }
  });
}

/** Samples VmRSS of one process every `intervalMs` between start() and stop(), keeping the peak. */
export class RssSampler {
  samples = 0;
  peakKb = 0;
  private timer: NodeJS.Timeout | undefined;
  constructor(
    private readonly pid: number,
    private readonly intervalMs = 20,
  ) {}
  private take(): void {
    const kb = statusKb(this.pid, "VmRSS");
    if (kb !== null) {
      this.samples++;
      this.peakKb = Math.max(this.peakKb, kb);
    }
  }
  start(): void {
    this.take();
    this.timer = setInterval(() => this.take(), this.intervalMs);
  }
  stop(): void {
    clearInterval(this.timer);
    this.take();
  }
}
