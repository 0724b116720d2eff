/** Runs a short SciPy/NumPy script (Debian python3-scipy) that reads JSON on stdin and prints JSON. */
import { execFileSync } from 'node:child_process';
import { REFERENCE_PYTHON } from '../../support/reference-tools.ts';

export function scipy<T>(script: string, input: unknown): T {
  const text = execFileSync(REFERENCE_PYTHON, ['-c', `import json, sys\nimport numpy as np\nfrom scipy import stats\nx = json.load(sys.stdin)\n${script}`], {
    input: JSON.stringify(input),
    encoding: 'utf8',
  });
  return JSON.parse(text) as T;
}
