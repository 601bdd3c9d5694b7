import type { SymmetricCsr } from './csr'

/**
 * Fill-reducing ordering: minimum degree on the quotient graph with approximate external degrees
 * and aggressive element absorption, after Amestoy, Davis & Duff, "An approximate minimum degree
 * ordering algorithm" (SIAM J. Matrix Anal. Appl. 17, 1996). Supervariable detection and mass
 * elimination are left out: our matrices come from 2D-manifold meshes (≈7 entries a row), where
 * the plain quotient graph is already fast enough (see scripts/bench-solver.ts).
 * Returns perm (n Int32Array): perm[k] = original index of the k-th pivot.
 */
export function minimumDegreeOrdering(a: Readonly<SymmetricCsr>): Int32Array {
  const n = a.n
  // status: 0 live variable, 1 live element (an eliminated pivot), 2 absorbed element
  const status = new Uint8Array(n)
  const adjVars: number[][] = new Array(n)
  const adjElems: number[][] = new Array(n)
  const elemVars: number[][] = new Array(n)
  const degree = new Int32Array(n)
  // degree buckets as doubly linked lists
  const head = new Int32Array(n + 1).fill(-1)
  const next = new Int32Array(n).fill(-1)
  const prev = new Int32Array(n).fill(-1)
  const insert = (i: number, d: number): void => {
    degree[i] = d
    const h = head[d]!
    next[i] = h
    prev[i] = -1
    if (h >= 0) prev[h] = i
    head[d] = i
  }
  const remove = (i: number): void => {
    const p = prev[i]!
    const q = next[i]!
    if (p >= 0) next[p] = q
    else head[degree[i]!] = q
    if (q >= 0) prev[q] = p
  }
  for (let i = 0; i < n; i++) {
    const row: number[] = []
    for (let p = a.rowStart[i]!; p < a.rowStart[i + 1]!; p++) {
      const j = a.columns[p]!
      if (j !== i) row.push(j)
    }
    adjVars[i] = row
    adjElems[i] = []
    elemVars[i] = []
    insert(i, row.length)
  }
  const mark = new Int32Array(n).fill(-1)
  const weightStamp = new Int32Array(n).fill(-1)
  const weight = new Int32Array(n)
  const perm = new Int32Array(n)
  let minDegree = 0
  for (let k = 0; k < n; k++) {
    while (head[minDegree]! < 0) minDegree++
    const p = head[minDegree]!
    remove(p)
    status[p] = 1
    perm[k] = p
    // the new element's variables: p's variable neighbours and the variables of its elements
    mark[p] = k
    const lp: number[] = []
    for (const v of adjVars[p]!) {
      if (status[v] === 0 && mark[v] !== k) {
        mark[v] = k
        lp.push(v)
      }
    }
    for (const e of adjElems[p]!) {
      if (status[e] !== 1) continue
      for (const v of elemVars[e]!) {
        if (status[v] === 0 && mark[v] !== k) {
          mark[v] = k
          lp.push(v)
        }
      }
      status[e] = 2
      elemVars[e] = []
    }
    elemVars[p] = lp
    adjVars[p] = []
    adjElems[p] = []
    // |Le \ Lp| for every element touching Lp
    for (const i of lp) {
      for (const e of adjElems[i]!) {
        if (status[e] !== 1) continue
        if (weightStamp[e] !== k) {
          weightStamp[e] = k
          weight[e] = elemVars[e]!.length
        }
        weight[e]!--
      }
    }
    const remaining = n - k - 1
    for (const i of lp) {
      const elems: number[] = []
      let d = lp.length - 1
      for (const e of adjElems[i]!) {
        if (status[e] !== 1) continue
        if (weight[e] === 0) {
          status[e] = 2 // aggressive absorption: Le ⊆ Lp
          elemVars[e] = []
          continue
        }
        elems.push(e)
        d += weight[e]!
      }
      elems.push(p)
      adjElems[i] = elems
      const vars: number[] = []
      for (const v of adjVars[i]!) if (status[v] === 0 && mark[v] !== k) vars.push(v)
      adjVars[i] = vars
      d += vars.length
      remove(i)
      const bounded = Math.min(d, remaining, degree[i]! + lp.length - 1)
      insert(i, bounded)
      if (bounded < minDegree) minDegree = bounded
    }
  }
  return perm
}
