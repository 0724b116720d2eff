/**
 * Fill-reducing ordering: minimum degree on the quotient graph (George & Liu 1989; the element
 * absorption scheme of Amestoy, Davis & Duff 1996, with exact external degrees instead of their
 * approximate ones — our matrices are small enough that exact degrees cost little and order slightly better).
 *
 * Run once per sparsity pattern; numeric factorisations reuse the result.
 */
import type { CscMatrix } from './csc.ts';

/**
 * Returns perm with perm[k] = the original index eliminated k-th. The matrix pattern is read as symmetric:
 * an entry (i, j) in either triangle makes i and j adjacent; the diagonal is ignored.
 */
export function minimumDegreeOrdering(M: Pick<CscMatrix, 'n' | 'colPtr' | 'rowIdx'>): Int32Array {
  const n = M.n;
  // Adjacency lists of variables (symmetrised, unique).
  const adjSets: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
  for (let j = 0; j < n; j++) {
    for (let p = M.colPtr[j]; p < M.colPtr[j + 1]; p++) {
      const i = M.rowIdx[p];
      if (i === j) continue;
      adjSets[i].add(j);
      adjSets[j].add(i);
    }
  }
  const varAdj: number[][] = adjSets.map((s) => Array.from(s));
  const elemAdj: number[][] = Array.from({ length: n }, () => []);
  const elemVars: number[][] = Array.from({ length: n }, () => []);
  const eliminated = new Uint8Array(n);
  const absorbed = new Uint8Array(n);
  const mark = new Int32Array(n);
  let tag = 0;

  // Degree buckets as doubly linked lists.
  const degree = new Int32Array(n);
  const head = new Int32Array(n + 1).fill(-1);
  const next = new Int32Array(n).fill(-1);
  const prev = new Int32Array(n).fill(-1);
  const insert = (i: number, d: number) => {
    degree[i] = d;
    next[i] = head[d];
    prev[i] = -1;
    if (head[d] >= 0) prev[head[d]] = i;
    head[d] = i;
  };
  const remove = (i: number) => {
    const d = degree[i];
    if (prev[i] >= 0) next[prev[i]] = next[i];
    else head[d] = next[i];
    if (next[i] >= 0) prev[next[i]] = prev[i];
  };
  for (let i = n - 1; i >= 0; i--) insert(i, varAdj[i].length);

  const perm = new Int32Array(n);
  let minDeg = 0;
  const Lp: number[] = [];
  for (let k = 0; k < n; k++) {
    while (head[minDeg] < 0) minDeg++;
    const p = head[minDeg];
    remove(p);
    perm[k] = p;
    eliminated[p] = 1;

    // L_p: the variables adjacent to p directly or through its elements.
    tag++;
    mark[p] = tag;
    Lp.length = 0;
    for (const v of varAdj[p]) {
      if (!eliminated[v] && mark[v] !== tag) {
        mark[v] = tag;
        Lp.push(v);
      }
    }
    for (const e of elemAdj[p]) {
      for (const v of elemVars[e]) {
        if (!eliminated[v] && mark[v] !== tag) {
          mark[v] = tag;
          Lp.push(v);
        }
      }
      absorbed[e] = 1;
      elemVars[e] = [];
    }
    elemVars[p] = Lp.slice();
    varAdj[p] = [];
    elemAdj[p] = [];

    // Prune: edges inside L_p are now represented by element p.
    const lpTag = tag;
    for (const i of Lp) {
      elemAdj[i] = elemAdj[i].filter((e) => !absorbed[e]);
      elemAdj[i].push(p);
      varAdj[i] = varAdj[i].filter((v) => mark[v] !== lpTag && !eliminated[v]);
    }
    // Exact external degree of each variable of L_p.
    for (const i of Lp) {
      tag++;
      mark[i] = tag;
      let d = 0;
      for (const v of varAdj[i]) {
        if (mark[v] !== tag) {
          mark[v] = tag;
          d++;
        }
      }
      for (const e of elemAdj[i]) {
        for (const v of elemVars[e]) {
          if (!eliminated[v] && mark[v] !== tag) {
            mark[v] = tag;
            d++;
          }
        }
      }
      remove(i);
      insert(i, d);
      if (d < minDeg) minDeg = d;
    }
  }
  return perm;
}

/** Inverse permutation: pinv[perm[k]] = k. */
export function invertPermutation(perm: Int32Array): Int32Array {
  const pinv = new Int32Array(perm.length);
  for (let k = 0; k < perm.length; k++) pinv[perm[k]] = k;
  return pinv;
}
