/**
 * The benchmark's own Python environment for its pip-installed peers (Clarabel, ECOS): a virtual environment
 * in the project, `.bench-venv/` (git-ignored), created on first use from the reference Python
 * (LANDREACH_PYTHON, default /usr/bin/python3) WITHOUT Debian's site packages — the ECOS wheel needs NumPy 2,
 * Debian's NumPy is 1.24. Each peer is installed with its own pip call, so one that pip cannot install does
 * not keep the other out. Whatever fails is said plainly and that peer is skipped; nothing here fails the
 * benchmark. CVXOPT is not installed here: it is Debian's python3-cvxopt, as in the reference tests.
 */
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { REFERENCE_PYTHON } from '../../support/reference-tools.ts';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
export const BENCH_VENV = join(ROOT, '.bench-venv');
const VENV_PYTHON = join(BENCH_VENV, 'bin', 'python');

/** What pip installs for each peer (pinned peers; NumPy 2 for the ECOS wheel). */
export const PEER_PACKAGES: Record<'clarabel' | 'ecos', string[]> = {
  clarabel: ['clarabel==0.11.1', 'numpy>=2', 'scipy'],
  ecos: ['ecos==2.0.14', 'numpy>=2', 'scipy'],
};

export interface PeerEnvironment {
  /** The venv's Python, or null when no virtual environment could be made. */
  python: string | null;
  /** The peers that import in it. */
  available: Set<'clarabel' | 'ecos'>;
  /** One line per peer left out, with the reason and the fix. */
  notes: string[];
}

function run(cmd: string, args: string[], timeout_ms: number) {
  const r = spawnSync(cmd, args, { encoding: 'utf8', timeout: timeout_ms, env: { ...process.env, PIP_DISABLE_PIP_VERSION_CHECK: '1' } });
  const tail = `${r.stderr ?? ''}${r.stdout ?? ''}`.trim().split('\n').slice(-3).join(' | ');
  return { ok: r.status === 0, tail: r.error ? String(r.error) : tail };
}

const imports = (peer: string) => existsSync(VENV_PYTHON) && run(VENV_PYTHON, ['-c', `import ${peer}, numpy, scipy`], 60_000).ok;

/** Makes (once) and checks the venv; installs the peers that are missing. */
export function peerEnvironment(log: (line: string) => void = console.log): PeerEnvironment {
  const notes: string[] = [];
  const available = new Set<'clarabel' | 'ecos'>();
  if (!existsSync(VENV_PYTHON)) {
    log(`  peers: creating ${BENCH_VENV} (${REFERENCE_PYTHON} -m venv, without Debian's site packages)`);
    const made = run(REFERENCE_PYTHON, ['-m', 'venv', BENCH_VENV], 300_000);
    if (!made.ok) {
      notes.push(`Clarabel and ECOS left out: ${REFERENCE_PYTHON} -m venv ${BENCH_VENV} failed (${made.tail}); on Debian: apt-get install python3-venv`);
      return { python: null, available, notes };
    }
  }
  for (const peer of ['clarabel', 'ecos'] as const) {
    if (!imports(peer)) {
      log(`  peers: pip install ${PEER_PACKAGES[peer].join(' ')} into ${BENCH_VENV}`);
      const pip = run(VENV_PYTHON, ['-m', 'pip', 'install', '--retries', '1', '--timeout', '30', ...PEER_PACKAGES[peer]], 900_000);
      if (!pip.ok || !imports(peer)) {
        notes.push(`${peer} left out: pip could not install ${PEER_PACKAGES[peer].join(' ')} (${pip.tail})`);
        continue;
      }
    }
    available.add(peer);
  }
  return { python: VENV_PYTHON, available, notes };
}
