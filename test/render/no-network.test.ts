import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { findBrowser } from '../../src/render/browser.ts';
import { BIN, DEMO, hasCommand, missingTool, removeDir, ROOT, tempDir } from '../helpers.ts';

/**
 * The PDF build makes no network connection: the whole build, the browser and every process
 * it starts, runs under strace (its -yy shows each socket's protocol and addresses), and the
 * trace is read for internet sockets. Chromium's one remaining call is its IPv6 reachability
 * check: a UDP connect() to a public address that picks a route and sends nothing (UDP has no
 * handshake). Any TCP connect, any DNS query (port 53) and any byte written to an internet
 * socket fails the test.
 */
const found = await findBrowser();
const skip =
  missingTool('Chromium or Chrome (PUPPETEER_EXECUTABLE_PATH, PATH or the puppeteer cache)', found !== undefined, 'apt-get install chromium, as .ci/run does.') ||
  missingTool('strace', hasCommand('strace', ['-V']), 'apt-get install strace, as .ci/run does.');

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

/** The trace's calls on internet sockets (TCP or UDP, v4 or v6), as strace -yy prints them. */
export function internetCalls(trace: string): { sends: string[]; tcpConnects: string[]; dns: string[]; udpConnects: string[] } {
  const lines = trace.split('\n').filter((line) => /<(TCP|UDP)(v6)?:/.test(line) || /sa_family=AF_INET6?,/.test(line));
  return {
    sends: lines.filter((line) => /\b(write|writev|send|sendto|sendmsg|sendmmsg)\(\d+<(TCP|UDP)(v6)?:/.test(line)),
    tcpConnects: lines.filter((line) => /\bconnect\(\d+<TCP(v6)?:/.test(line)),
    dns: lines.filter((line) => /htons\(53\)/.test(line)),
    udpConnects: lines.filter((line) => /\bconnect\(\d+<UDP(v6)?:/.test(line)),
  };
}

describe('reading a trace', () => {
  it('tells a DNS query, a TCP connect and a send from a route probe', () => {
    const trace = [
      '101 connect(27<UDPv6:[1651026]>, {sa_family=AF_INET6, sin6_port=htons(443), inet_pton(AF_INET6, "2001:4860:4860::8888", &sin6_addr)}, 28) = 0',
      '102 connect(18<UDP:[1650552]>, {sa_family=AF_INET, sin_port=htons(53), sin_addr=inet_addr("10.0.0.53")}, 16) = 0',
      '102 sendmmsg(18<UDP:[10.0.0.2:4000->10.0.0.53:53]>, [{msg_hdr={...}}], 2, MSG_NOSIGNAL) = 2',
      '103 connect(40<TCP:[1651769]>, {sa_family=AF_INET, sin_port=htons(443), sin_addr=inet_addr("192.0.2.1")}, 16) = -1 EINPROGRESS',
      '104 sendmsg(12<UNIX-STREAM:[1650000->1650001]>, {msg_name=NULL}, MSG_NOSIGNAL) = 8',
    ].join('\n');
    const calls = internetCalls(trace);
    expect(calls.udpConnects).toHaveLength(2);
    expect(calls.dns).toHaveLength(1);
    expect(calls.sends).toHaveLength(1);
    expect(calls.tcpConnects).toHaveLength(1);
  });
});

describe.skipIf(skip)('the PDF build and its browser', () => {
  it('make no network connection: no DNS, no TCP, not a byte sent to an internet socket', async () => {
    const dir = await tempDir();
    dirs.push(dir);
    const traceFile = path.join(dir, 'trace');
    const run = spawnSync('strace', ['-f', '-qq', '-yy', '-s', '0', '-e', 'trace=connect,sendto,sendmsg,sendmmsg,write,writev', '-o', traceFile, process.execPath, BIN, 'build', '--data', DEMO, '--out', path.join(dir, 'out'), '--pdf'], {
      cwd: ROOT,
      encoding: 'utf8',
      env: { ...process.env, CI: 'true' },
      timeout: 55_000,
    });
    expect(run.status, run.stderr).toBe(0);
    expect(run.stderr).toContain('PDF: using');
    const trace = await readFile(traceFile, 'utf8');
    // The trace saw the browser: its processes talk over Unix sockets.
    expect(trace).toMatch(/UNIX-STREAM/);
    const calls = internetCalls(trace);
    expect(calls.dns).toEqual([]);
    expect(calls.tcpConnects).toEqual([]);
    expect(calls.sends).toEqual([]);
    for (const probe of calls.udpConnects) expect(probe).toMatch(/sin6_port=htons\(443\).*"2001:4860:4860::8888"/);
  }, 60_000);
});
